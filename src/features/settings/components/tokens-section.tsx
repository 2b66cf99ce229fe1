import { useState } from 'react';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { TextField } from '@/components/ui/field';
import { EmptyState, InlineError } from '@/components/ui/states';
import { Table, TBody, TD, TH, THead, TR } from '@/components/ui/table';
import { formatDateTime, formatRelative } from '@/lib/format';
import { useCreateToken } from '../api/create-token';
import { useTokens } from '../api/get-tokens';
import { useRevokeToken } from '../api/revoke-token';
import { SettingsSection } from './section';

/**
 * API tokens for `pointfold submit` and scripts. A new token is shown once, with a copy button;
 * only its label and dates are kept in view afterwards.
 */
export function TokensSection({ slug, owner }: { slug: string; owner: boolean }) {
  const tokens = useTokens(slug);
  const create = useCreateToken(slug);
  const revoke = useRevokeToken(slug);
  const [label, setLabel] = useState('');
  const [labelError, setLabelError] = useState<string | undefined>();
  const [copied, setCopied] = useState(false);
  const secret = create.data?.token ?? null;

  return (
    <SettingsSection
      id="tokens"
      title="API tokens"
      description={
        <>
          For the command line (<code className="num text-xs">pointfold submit --token …</code>) and scripts. A token acts with your role in this
          workspace.{owner && ' As an owner you see and can revoke everyone’s.'}
        </>
      }
    >
      <form
        noValidate
        aria-label="Create an API token"
        className="flex flex-wrap items-start gap-3 rounded-lg border border-rule bg-card p-4"
        onSubmit={(e) => {
          e.preventDefault();
          const trimmed = label.trim();
          if (!trimmed || trimmed.length > 200) {
            setLabelError('Give the token a label of 1–200 characters, e.g. “cluster submit script”.');
            return;
          }
          setLabelError(undefined);
          setCopied(false);
          create.mutate(trimmed, { onSuccess: () => setLabel('') });
        }}
      >
        <TextField
          label="Label"
          className="min-w-64 flex-1"
          placeholder="e.g. cluster submit script"
          value={label}
          error={labelError}
          onChange={(e) => setLabel(e.target.value)}
        />
        <Button type="submit" className="mt-6" busy={create.isPending}>
          Create token
        </Button>
        {create.error && (
          <div className="basis-full">
            <InlineError>{create.error.message}</InlineError>
          </div>
        )}
      </form>

      {revoke.error && <InlineError>{revoke.error.message}</InlineError>}
      {tokens.length === 0 ? (
        <EmptyState title="No API tokens">Create one to submit batches from a cluster with the command line.</EmptyState>
      ) : (
        <Table caption="API tokens" hideCaption>
          <THead>
            <TR>
              <TH>Label</TH>
              {owner && <TH>Holder</TH>}
              <TH>Created</TH>
              <TH>Last used</TH>
              <TH className="sr-only">Actions</TH>
            </TR>
          </THead>
          <TBody>
            {tokens.map((t) => (
              <TR key={t.id} className={t.revokedAt ? 'text-ink-soft' : undefined}>
                <TD className="font-medium">
                  {t.label} {t.revokedAt && <Badge className="ml-1">revoked</Badge>}
                </TD>
                {owner && <TD className="text-ink-soft">{t.user?.name ?? '—'}</TD>}
                <TD className="text-ink-soft">{formatDateTime(t.createdAt)}</TD>
                <TD className="text-ink-soft">
                  {t.lastUsedAt ? <time dateTime={t.lastUsedAt} title={formatDateTime(t.lastUsedAt)}>{formatRelative(t.lastUsedAt)}</time> : 'never'}
                </TD>
                <TD className="text-right">
                  {!t.revokedAt && (
                    <Button variant="danger" size="sm" busy={revoke.isPending && revoke.variables === t.id} onClick={() => revoke.mutate(t.id)}>
                      Revoke<span className="sr-only"> token {t.label}</span>
                    </Button>
                  )}
                </TD>
              </TR>
            ))}
          </TBody>
        </Table>
      )}

      <Dialog
        open={!!secret}
        onClose={() => create.reset()}
        title="Your new API token"
        footer={<Button onClick={() => create.reset()}>I’ve stored it</Button>}
      >
        <p className="font-medium text-ochre">Copy it now — you won’t see it again.</p>
        <p className="mt-1 text-ink-soft">Pointfold keeps only a hash. If you lose it, revoke it and create another.</p>
        <div className="mt-3 flex items-center gap-2">
          <code aria-label="Token" className="num min-w-0 flex-1 rounded-md border border-rule bg-paper px-3 py-2 text-xs break-all select-all">
            {secret}
          </code>
          <Button
            variant="secondary"
            size="sm"
            onClick={async () => {
              if (!secret) return;
              try {
                await navigator.clipboard.writeText(secret);
                setCopied(true);
              } catch {
                setCopied(false);
              }
            }}
          >
            {copied ? 'Copied' : 'Copy'}
          </Button>
        </div>
        <p role="status" className="sr-only">
          {copied ? 'Token copied to the clipboard' : ''}
        </p>
      </Dialog>
    </SettingsSection>
  );
}
