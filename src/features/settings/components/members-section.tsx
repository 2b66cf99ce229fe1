import { useState } from 'react';
import { roleSchema, type Role } from '@shared/contracts/api';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { inputClass } from '@/components/ui/field';
import { InlineError } from '@/components/ui/states';
import { Table, TBody, TD, TH, THead, TR } from '@/components/ui/table';
import { cx } from '@/lib/cx';
import { formatDate } from '@/lib/format';
import { useMembers, type Member } from '../api/get-members';
import { useRemoveMember } from '../api/remove-member';
import { useUpdateMemberRole } from '../api/update-member-role';
import { SettingsSection } from './section';

export const roleNotes: Record<Role, string> = {
  owner: 'everything, plus members, invitations and defaults',
  chemist: 'uploads batches, re-snaps, downloads',
  reviewer: 'reads, accepts or flags, signs off; no uploads',
};

/** Members and their roles. Owners change roles and remove people; the API guards the last owner. */
export function MembersSection({ slug, owner, myUserId }: { slug: string; owner: boolean; myUserId: string }) {
  const members = useMembers(slug);
  const updateRole = useUpdateMemberRole(slug);
  const remove = useRemoveMember(slug);
  const [removing, setRemoving] = useState<Member | null>(null);
  const error = updateRole.error ?? remove.error;

  return (
    <SettingsSection
      id="members"
      title="Members"
      description={
        <>
          Owners: {roleNotes.owner}. Chemists: {roleNotes.chemist}. Reviewers: {roleNotes.reviewer}.
        </>
      }
    >
      {error && <InlineError>{error.message}</InlineError>}
      <Table caption="Members of this workspace" hideCaption>
        <THead>
          <TR>
            <TH>Name</TH>
            <TH>E-mail</TH>
            <TH>Role</TH>
            <TH>Joined</TH>
            {owner && <TH className="sr-only">Actions</TH>}
          </TR>
        </THead>
        <TBody>
          {members.map((m) => {
            const name = m.user.name || m.user.login;
            return (
              <TR key={m.user.id}>
                <TD className="font-medium">
                  {name}
                  {m.user.id === myUserId && <span className="ml-2 text-xs font-normal text-ink-soft">(you)</span>}
                </TD>
                <TD className="text-ink-soft">{m.user.email}</TD>
                <TD>
                  {owner ? (
                    <select
                      aria-label={`Role of ${name}`}
                      className={cx(inputClass, 'h-8 w-32')}
                      value={m.role}
                      disabled={updateRole.isPending}
                      onChange={(e) => {
                        remove.reset();
                        updateRole.mutate({ userId: m.user.id, role: e.target.value as Role });
                      }}
                    >
                      {roleSchema.options.map((r) => (
                        <option key={r} value={r}>
                          {r}
                        </option>
                      ))}
                    </select>
                  ) : (
                    <Badge>{m.role}</Badge>
                  )}
                </TD>
                <TD className="text-ink-soft">{formatDate(m.joinedAt)}</TD>
                {owner && (
                  <TD className="text-right">
                    <Button variant="danger" size="sm" onClick={() => (updateRole.reset(), setRemoving(m))}>
                      Remove<span className="sr-only"> {name}</span>
                    </Button>
                  </TD>
                )}
              </TR>
            );
          })}
        </TBody>
      </Table>
      <Dialog
        open={!!removing}
        onClose={() => setRemoving(null)}
        title="Remove from the workspace?"
        footer={
          <>
            <Button variant="secondary" onClick={() => setRemoving(null)}>
              Keep
            </Button>
            <Button
              variant="danger"
              busy={remove.isPending}
              onClick={() => removing && remove.mutate(removing.user.id, { onSettled: () => setRemoving(null) })}
            >
              Remove
            </Button>
          </>
        }
      >
        {removing && (
          <p>
            {removing.user.name || removing.user.login} ({removing.user.email}) loses access to every batch here at once. Their
            batches stay. They can come back only with a new invitation.
          </p>
        )}
      </Dialog>
    </SettingsSection>
  );
}
