import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { EmptyState, InlineError } from '@/components/ui/states';
import { Table, TBody, TD, TH, THead, TR } from '@/components/ui/table';
import { formatDateTime } from '@/lib/format';
import type { ExportTemplate } from '@/lib/export-templates';
import { useDeleteTemplate } from '../api/delete-template';
import { useExportTemplates } from '../api/get-templates';
import { useSaveTemplate } from '../api/save-template';
import { SettingsSection } from './section';
import { TemplateForm } from './template-form';

/**
 * Export templates (owners): input decks with placeholders that chemists choose for a batch; the
 * batch ZIP then holds one rendered deck per structure. A batch keeps its own copy, so editing or
 * deleting a template here never changes a finished batch.
 */
export function TemplatesSection({ slug }: { slug: string }) {
  const query = useExportTemplates(slug);
  const templates = query.data ?? [];
  const save = useSaveTemplate(slug);
  const remove = useDeleteTemplate(slug);
  const [editing, setEditing] = useState<ExportTemplate | 'new' | null>(null);
  const [deleting, setDeleting] = useState<ExportTemplate | null>(null);

  const close = () => {
    setEditing(null);
    save.reset();
  };

  return (
    <SettingsSection
      id="templates"
      title="Export templates"
      description="Input decks with placeholders for the geometry, charge, multiplicity and groups. Chemists pick them when uploading; the batch download then holds one filled-in deck per structure. Batches keep the version they were uploaded with."
      actions={
        editing === null && (
          <Button variant="secondary" onClick={() => setEditing('new')}>
            New template
          </Button>
        )
      }
    >
      {editing !== null && (
        <div className="rounded-lg border border-rule bg-card p-4">
          <TemplateForm
            key={editing === 'new' ? 'new' : editing.id}
            initial={editing === 'new' ? undefined : { name: editing.name, fileExtension: editing.fileExtension, body: editing.body }}
            submitting={save.isPending}
            submitError={save.error ? save.error.message : null}
            onCancel={close}
            onSubmit={(values) => save.mutate({ values, id: editing === 'new' ? undefined : editing.id }, { onSuccess: close })}
          />
        </div>
      )}
      {remove.error && <InlineError>{remove.error.message}</InlineError>}
      {query.error && <InlineError>Export templates could not be loaded: {query.error.message}</InlineError>}
      {query.isPending ? (
        <p className="text-sm text-ink-soft">Loading templates…</p>
      ) : query.error ? null : templates.length === 0 ? (
        editing === null && <EmptyState title="No export templates">Add one to hand out ready-to-run decks with every batch.</EmptyState>
      ) : (
        <Table caption="Export templates" hideCaption>
          <THead>
            <TR>
              <TH>Name</TH>
              <TH>File</TH>
              <TH>Changed</TH>
              <TH className="sr-only">Actions</TH>
            </TR>
          </THead>
          <TBody>
            {templates.map((t) => (
              <TR key={t.id}>
                <TD className="font-medium">{t.name}</TD>
                <TD className="num text-ink-soft">*.{t.fileExtension}</TD>
                <TD className="text-ink-soft">{formatDateTime(t.updatedAt)}</TD>
                <TD className="text-right whitespace-nowrap">
                  <Button variant="quiet" size="sm" onClick={() => setEditing(t)}>
                    Edit<span className="sr-only"> template {t.name}</span>
                  </Button>
                  <Button variant="danger" size="sm" className="ml-2" onClick={() => setDeleting(t)}>
                    Delete<span className="sr-only"> template {t.name}</span>
                  </Button>
                </TD>
              </TR>
            ))}
          </TBody>
        </Table>
      )}
      <Dialog
        open={!!deleting}
        onClose={() => setDeleting(null)}
        title="Delete this template?"
        footer={
          <>
            <Button variant="quiet" onClick={() => setDeleting(null)}>
              Keep it
            </Button>
            <Button
              variant="danger"
              busy={remove.isPending}
              onClick={() => deleting && remove.mutate(deleting.id, { onSettled: () => setDeleting(null) })}
            >
              Delete
            </Button>
          </>
        }
      >
        <p>
          <span className="font-medium">{deleting?.name}</span> will no longer be offered for new batches. Batches already uploaded with it keep their decks.
        </p>
      </Dialog>
    </SettingsSection>
  );
}
