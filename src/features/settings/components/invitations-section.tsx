import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { invitationCreateSchema, roleSchema } from '@shared/contracts/api';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { EmptyState, InlineError } from '@/components/ui/states';
import { Table, TBody, TD, TH, THead, TR } from '@/components/ui/table';
import { formatDateTime } from '@/lib/format';
import { useCreateInvitation, type InvitationInput } from '../api/create-invitation';
import { useInvitations, type Invitation } from '../api/get-invitations';
import { useRevokeInvitation } from '../api/revoke-invitation';
import { SettingsSection } from './section';

function invitationState(inv: Invitation, now = Date.now()): { label: string; tone: 'moss' | 'lapis' | 'neutral' } {
  if (inv.acceptedAt) return { label: 'accepted', tone: 'moss' };
  if (new Date(inv.expiresAt).getTime() < now) return { label: 'expired', tone: 'neutral' };
  return { label: 'pending', tone: 'lapis' };
}

/** Invite by e-mail with a role; list and revoke. The server mails a single-use link. */
export function InvitationsSection({ slug }: { slug: string }) {
  const invitations = useInvitations(slug);
  const create = useCreateInvitation(slug);
  const revoke = useRevokeInvitation(slug);
  const form = useForm<InvitationInput>({
    resolver: zodResolver(invitationCreateSchema),
    defaultValues: { email: '', role: 'chemist' },
  });

  return (
    <SettingsSection id="invitations" title="Invitations" description="The invitee gets an e-mail with a link that works once; they sign in with the account of that address.">
      <form
        noValidate
        aria-label="Invite someone"
        className="flex flex-wrap items-start gap-3 rounded-lg border border-rule bg-card p-4"
        onSubmit={form.handleSubmit((values) => create.mutate(values, { onSuccess: () => form.reset({ email: '', role: values.role }) }))}
      >
        <TextField
          label="E-mail"
          type="email"
          autoComplete="off"
          className="min-w-64 flex-1"
          error={form.formState.errors.email ? 'Enter an e-mail address, e.g. name@example.org.' : undefined}
          {...form.register('email')}
        />
        <SelectField label="Role" className="w-40" {...form.register('role')}>
          {roleSchema.options.map((r) => (
            <option key={r} value={r}>
              {r}
            </option>
          ))}
        </SelectField>
        <Button type="submit" className="mt-6" busy={create.isPending}>
          Send invitation
        </Button>
        {create.error && (
          <div className="basis-full">
            <InlineError>{create.error.message}</InlineError>
          </div>
        )}
        {create.isSuccess && !create.error && (
          <p role="status" className="basis-full text-sm text-moss">
            Invitation sent to {create.data.email}.
          </p>
        )}
      </form>
      {revoke.error && <InlineError>{revoke.error.message}</InlineError>}
      {invitations.length === 0 ? (
        <EmptyState title="No invitations yet">Invite a colleague above; pending invitations show here until accepted.</EmptyState>
      ) : (
        <Table caption="Invitations" hideCaption>
          <THead>
            <TR>
              <TH>E-mail</TH>
              <TH>Role</TH>
              <TH>State</TH>
              <TH>Expires</TH>
              <TH className="sr-only">Actions</TH>
            </TR>
          </THead>
          <TBody>
            {invitations.map((inv) => {
              const state = invitationState(inv);
              return (
                <TR key={inv.id}>
                  <TD className="font-medium">{inv.email}</TD>
                  <TD>{inv.role}</TD>
                  <TD>
                    <Badge tone={state.tone}>{state.label}</Badge>
                  </TD>
                  <TD className="text-ink-soft">{inv.acceptedAt ? '—' : formatDateTime(inv.expiresAt)}</TD>
                  <TD className="text-right">
                    {state.label === 'pending' && (
                      <Button variant="danger" size="sm" busy={revoke.isPending && revoke.variables === inv.id} onClick={() => revoke.mutate(inv.id)}>
                        Revoke<span className="sr-only"> the invitation of {inv.email}</span>
                      </Button>
                    )}
                  </TD>
                </TR>
              );
            })}
          </TBody>
        </Table>
      )}
    </SettingsSection>
  );
}
