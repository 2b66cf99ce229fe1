import { useState } from 'react';
import { Pagination } from '@/components/ui/pagination';
import { Spinner } from '@/components/ui/spinner';
import { EmptyState, ErrorState } from '@/components/ui/states';
import { Table, TBody, TD, TH, THead, TR } from '@/components/ui/table';
import { formatDateTime } from '@/lib/format';
import { useAudit } from '../api/get-audit';
import { SettingsSection } from './section';

/** `invitation.created` → `invitation created`. */
export function describeAction(action: string): string {
  return action.replace(/[._-]+/g, ' ');
}

/** `{ email: 'a@b', role: 'chemist' }` → `email a@b · role chemist` (ids left out: they mean nothing to a reader). */
export function describeDetail(detail: Record<string, unknown>): string {
  return Object.entries(detail)
    .filter(([key, value]) => !/id$/i.test(key) && value !== null && value !== undefined && typeof value !== 'object')
    .map(([key, value]) => `${key.replace(/([A-Z])/g, ' $1').toLowerCase()} ${String(value)}`)
    .join(' · ');
}

/** Who did what in the workspace, newest first (owners). */
export function AuditSection({ slug }: { slug: string }) {
  const [page, setPage] = useState(1);
  const audit = useAudit(slug, page);

  return (
    <SettingsSection id="audit" title="Audit log" description="Membership, invitation, token and settings changes, batch uploads and sign-offs.">
      {audit.isPending ? (
        <Spinner label="Loading the audit log" />
      ) : audit.isError ? (
        <ErrorState title="The audit log could not be loaded" message={audit.error.message} />
      ) : audit.data.items.length === 0 ? (
        <EmptyState title="Nothing recorded yet" />
      ) : (
        <div className="flex flex-col gap-3">
          <Table caption="Audit log" hideCaption>
            <THead>
              <TR>
                <TH>When</TH>
                <TH>Who</TH>
                <TH>What</TH>
                <TH>Detail</TH>
              </TR>
            </THead>
            <TBody>
              {audit.data.items.map((entry) => (
                <TR key={entry.id}>
                  <TD className="num text-xs whitespace-nowrap text-ink-soft">{formatDateTime(entry.createdAt)}</TD>
                  <TD>{entry.actor?.name ?? 'system'}</TD>
                  <TD className="font-medium">{describeAction(entry.action)}</TD>
                  <TD className="text-ink-soft">{describeDetail(entry.detail) || '—'}</TD>
                </TR>
              ))}
            </TBody>
          </Table>
          <Pagination page={audit.data.page} pageSize={audit.data.pageSize} total={audit.data.total} onPage={setPage} label="Audit log pages" />
        </div>
      )}
    </SettingsSection>
  );
}
