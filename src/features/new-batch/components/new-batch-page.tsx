import { useQuery } from '@tanstack/react-query';
import { useEffect, useRef, useState } from 'react';
import { useNavigate } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorState } from '@/components/ui/states';
import { exportTemplatesQueryOptions } from '@/lib/export-templates';
import { canWrite, useCurrentWorkspace } from '@/lib/workspace-context';
import { useCreateBatch } from '../api/create-batch';
import { usePreviewBatch } from '../api/preview-batch';
import { NewBatchForm } from './new-batch-form';
import { PreviewPanel } from './preview-panel';

/** `/w/:slug/new` — upload files, check what was recognised, choose settings, submit. */
export function NewBatchPage() {
  const { workspace, role } = useCurrentWorkspace();
  const navigate = useNavigate();
  const preview = usePreviewBatch(workspace.slug);
  const create = useCreateBatch(workspace.slug);
  const [files, setFiles] = useState<File[]>([]);
  // Not a loader dependency: the form is usable at once, the template choice appears when known.
  const templates = useQuery({ ...exportTemplatesQueryOptions(workspace.slug), enabled: canWrite(role) });
  const previewRef = useRef(preview);
  previewRef.current = preview;

  // Ask the server what it recognises whenever the file list settles.
  useEffect(() => {
    if (files.length === 0) {
      previewRef.current.reset();
      return;
    }
    const timer = setTimeout(() => previewRef.current.mutate(files), 250);
    return () => clearTimeout(timer);
  }, [files]);

  if (!canWrite(role)) {
    return (
      <>
        <PageHeader eyebrow={workspace.name} title="New batch" />
        <ErrorState title="Your role doesn’t allow uploads" message="Reviewers read and review batches; an owner or a chemist uploads them." />
      </>
    );
  }

  return (
    <>
      <PageHeader eyebrow={workspace.name} title="New batch" description="Perceive each structure’s point group, snap it onto exact symmetry, and get clean input files back." />
      <NewBatchForm
        defaults={workspace.defaults}
        templates={templates.data}
        onFilesChange={setFiles}
        preview={
          files.length > 0 && (
            <PreviewPanel preview={preview.data} pending={preview.isPending} error={preview.error ? preview.error.message : null} />
          )
        }
        progress={create.progress}
        submitting={create.isPending}
        submitError={create.error ? create.error.message : null}
        onSubmit={async (values) => {
          const batch = await create.mutateAsync(values).catch(() => null);
          if (batch) navigate(`/w/${encodeURIComponent(workspace.slug)}/batches/${encodeURIComponent(batch.id)}`);
        }}
      />
    </>
  );
}
