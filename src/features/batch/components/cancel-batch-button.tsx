import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { InlineError } from '@/components/ui/states';
import { useCancelBatch } from '../api/cancel-batch';

/** Cancels a running batch after a confirmation; finished structures are kept. */
export function CancelBatchButton({ slug, batchId }: { slug: string; batchId: string }) {
  const [open, setOpen] = useState(false);
  const cancel = useCancelBatch(slug, batchId);
  return (
    <>
      <Button variant="danger" onClick={() => setOpen(true)}>
        Cancel batch
      </Button>
      <Dialog
        open={open}
        onClose={() => setOpen(false)}
        title="Cancel this batch?"
        footer={
          <>
            <Button variant="secondary" onClick={() => setOpen(false)}>
              Keep running
            </Button>
            <Button variant="danger" busy={cancel.isPending} onClick={() => cancel.mutate(undefined, { onSuccess: () => setOpen(false) })}>
              Cancel batch
            </Button>
          </>
        }
      >
        <p>Structures that have finished keep their results; the rest are marked cancelled and can be re-snapped later.</p>
        {cancel.error && <InlineError>{cancel.error.message}</InlineError>}
      </Dialog>
    </>
  );
}
