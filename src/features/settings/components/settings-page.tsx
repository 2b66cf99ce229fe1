import { PageHeader } from '@/components/ui/page-header';
import { focusRing } from '@/components/ui/focus';
import { cx } from '@/lib/cx';
import { isOwner, useCurrentWorkspace } from '@/lib/workspace-context';
import { AuditSection } from './audit-section';
import { DefaultsSection } from './defaults-section';
import { DevMailboxSection } from './dev-mailbox-section';
import { InvitationsSection } from './invitations-section';
import { MembersSection } from './members-section';
import { TemplatesSection } from './templates-section';
import { TokensSection } from './tokens-section';

/**
 * `/w/:slug/settings`. Owners manage members, invitations, tokens, defaults and read the audit
 * log; other members see who is in the workspace and manage their own API tokens.
 */
export function SettingsPage() {
  const { workspace, role, user } = useCurrentWorkspace();
  const myUserId = user.id;
  const owner = isOwner(role);
  const sections = owner
    ? [
        ['members', 'Members'],
        ['invitations', 'Invitations'],
        ['tokens', 'API tokens'],
        ['defaults', 'Defaults'],
        ['templates', 'Export templates'],
        ['audit', 'Audit log'],
      ]
    : [
        ['tokens', 'API tokens'],
        ['members', 'Members'],
      ];

  return (
    <>
      <PageHeader
        eyebrow={workspace.name}
        title={owner ? 'Workspace settings' : 'Your API tokens'}
        description={owner ? 'Members and roles, invitations, API tokens, defaults for new batches, export templates, and the audit log.' : 'Tokens for the command line, and who is in this workspace.'}
      />
      <nav aria-label="On this page" className="mb-8 flex flex-wrap gap-1.5 text-sm">
        {sections.map(([id, label]) => (
          <a key={id} href={`#${id}`} className={cx('rounded-full border border-rule bg-card px-3 py-1 text-ink-soft hover:text-ink', focusRing)}>
            {label}
          </a>
        ))}
      </nav>
      <div className="flex flex-col gap-12">
        {owner ? (
          <>
            <MembersSection slug={workspace.slug} owner myUserId={myUserId} />
            <InvitationsSection slug={workspace.slug} />
            <TokensSection slug={workspace.slug} owner />
            <DefaultsSection key={JSON.stringify(workspace.defaults)} slug={workspace.slug} defaults={workspace.defaults} />
            <TemplatesSection slug={workspace.slug} />
            <AuditSection slug={workspace.slug} />
            <DevMailboxSection slug={workspace.slug} />
          </>
        ) : (
          <>
            <TokensSection slug={workspace.slug} owner={false} />
            <MembersSection slug={workspace.slug} owner={false} myUserId={myUserId} />
          </>
        )}
      </div>
    </>
  );
}
