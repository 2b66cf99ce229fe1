import { zodResolver } from '@hookform/resolvers/zod';
import type { ReactNode } from 'react';
import { Controller, FormProvider, useForm } from 'react-hook-form';
import type { SnapSettings } from '@shared/contracts/settings';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { SnapSettingsFields } from '@/components/ui/snap-settings-fields';
import { InlineError } from '@/components/ui/states';
import { toFormSettings } from '@/lib/snap-settings-form';
import { newBatchFormSchema, newBatchMessages, suggestName, type NewBatchFormInput, type NewBatchValues } from '../form-schema';
import { DropZone } from './drop-zone';

/**
 * The new-batch form: files, a name, and the snap settings starting from the workspace
 * defaults. Validates inline with `snapSettingsSchema` (through zod) and hands the parsed values
 * to `onSubmit`. `preview` is rendered between the files and the settings.
 */
export function NewBatchForm({
  defaults,
  onSubmit,
  onFilesChange,
  preview,
  progress,
  submitting = false,
  submitError,
}: {
  defaults: SnapSettings;
  onSubmit: (values: NewBatchValues) => void | Promise<void>;
  onFilesChange?: (files: File[]) => void;
  preview?: ReactNode;
  progress?: number[] | null;
  submitting?: boolean;
  submitError?: string | null;
}) {
  const form = useForm<NewBatchFormInput, unknown, NewBatchValues>({
    resolver: zodResolver(newBatchFormSchema),
    defaultValues: {
      name: '',
      files: [],
      settings: toFormSettings(defaults),
    },
    mode: 'onSubmit',
    reValidateMode: 'onChange',
  });
  const { register, handleSubmit, control, formState, watch } = form;
  const files = watch('files');

  return (
    <FormProvider {...form}>
      <form
        noValidate
        aria-label="New batch"
        onSubmit={handleSubmit((values) => onSubmit({ ...values, name: values.name || suggestName(values.files) }))}
        className="flex flex-col gap-8"
      >
        <section aria-labelledby="nb-files" className="flex flex-col gap-3">
          <h2 id="nb-files" className="text-base font-semibold">
            1 · Files
          </h2>
          <Controller
            control={control}
            name="files"
            render={({ field, fieldState }) => (
              <DropZone
                files={field.value}
                onChange={(next) => {
                  field.onChange(next);
                  onFilesChange?.(next);
                }}
                progress={progress}
                disabled={submitting}
                error={fieldState.error ? newBatchMessages.files : undefined}
              />
            )}
          />
          {preview}
        </section>

        <section aria-labelledby="nb-settings" className="flex flex-col gap-5">
          <h2 id="nb-settings" className="text-base font-semibold">
            2 · Snap settings
          </h2>
          <p className="-mt-3 text-sm text-ink-soft">Starting from this workspace’s defaults. Lengths in Å.</p>
          <SnapSettingsFields prefix="settings" idPrefix="nb" />
        </section>

        <section aria-labelledby="nb-submit" className="flex flex-col gap-4 border-t border-rule pt-6">
          <h2 id="nb-submit" className="sr-only">
            Submit
          </h2>
          <TextField
            id="nb-name"
            label="Batch name"
            className="max-w-md"
            placeholder={suggestName(files) || 'e.g. ligand series, round 2'}
            hint="Empty: named after the files."
            error={formState.errors.name ? newBatchMessages.name : undefined}
            {...register('name')}
          />
          {submitError && <InlineError>{submitError}</InlineError>}
          <div className="flex items-center gap-3">
            <Button type="submit" busy={submitting}>
              {submitting ? 'Uploading…' : 'Upload and snap'}
            </Button>
            <span className="text-xs text-ink-soft">Structures are queued for the workers as soon as the upload ends.</span>
          </div>
        </section>
      </form>
    </FormProvider>
  );
}
