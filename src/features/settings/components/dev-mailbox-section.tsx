import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { EmptyState, ErrorState } from '@/components/ui/states';
import { formatDateTime } from '@/lib/format';
import { useDevMailbox } from '../api/get-dev-mailbox';
import { SettingsSection } from './section';

/**
 * The local fake inbox (development only): mail sent to this workspace's members and invitees,
 * so an invitation can be followed without a real mail account. Hidden when the API says 404.
 */
export function DevMailboxSection({ slug }: { slug: string }) {
  const mailbox = useDevMailbox(slug);
  if (mailbox.isSuccess && mailbox.data === null) return null;

  return (
    <SettingsSection
      id="dev-mailbox"
      title="Development mailbox"
      description="Mail the app sent to people of this workspace, caught by the local mail server. Development only."
      actions={
        <Button variant="secondary" size="sm" busy={mailbox.isFetching} onClick={() => void mailbox.refetch()}>
          Refresh
        </Button>
      }
    >
      {mailbox.isPending ? (
        <Spinner label="Opening the mailbox" />
      ) : mailbox.isError ? (
        <ErrorState title="The mailbox could not be read" message={mailbox.error.message} />
      ) : mailbox.data && mailbox.data.length === 0 ? (
        <EmptyState title="No mail yet">Invitations and batch-finished notices appear here.</EmptyState>
      ) : (
        <ul className="flex flex-col gap-2">
          {mailbox.data?.map((m) => (
            <li key={m.id} className="rounded-lg border border-rule bg-card">
              <details>
                <summary className="flex cursor-pointer flex-wrap items-baseline gap-x-3 px-4 py-2.5 text-sm">
                  <span className="font-medium">{m.subject || '(no subject)'}</span>
                  <span className="text-ink-soft">to {m.to}</span>
                  <span className="num ml-auto text-xs text-ink-soft">{formatDateTime(m.date)}</span>
                </summary>
                <pre className="num overflow-x-auto border-t border-rule px-4 py-3 text-xs whitespace-pre-wrap text-ink">{m.text}</pre>
              </details>
            </li>
          ))}
        </ul>
      )}
    </SettingsSection>
  );
}
