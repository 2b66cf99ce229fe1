import { zodResolver } from '@hookform/resolvers/zod';
import type { ReactNode } from 'react';
import { Controller, FormProvider, useForm } from 'react-hook-form';
import type { ExportTemplateDto } from '@shared/contracts/api';
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
  templates = [],
  onSubmit,
  onFilesChange,
  preview,
  progress,
  submitting = false,
  submitError,
}: {
  defaults: SnapSettings;
  /** The workspace's export templates; the choice is hidden when there are none. */
  templates?: readonly ExportTemplateDto[];
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
      templateIds: [],
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

        {templates.length > 0 && (
          <section aria-labelledby="nb-templates" className="flex flex-col gap-3">
            <h2 id="nb-templates" className="text-base font-semibold">
              3 · Export templates
            </h2>
            <p className="-mt-2 text-sm text-ink-soft">Each chosen template adds one filled-in deck per structure to the download.</p>
            <Controller
              control={control}
              name="templateIds"
              render={({ field }) => (
                <fieldset className="flex flex-col gap-1.5">
                  <legend className="sr-only">Export templates for this batch</legend>
                  {templates.map((t) => (
                    <label key={t.id} className="flex items-center gap-2 text-sm">
                      <input
                        type="checkbox"
                        checked={field.value.includes(t.id)}
                        disabled={submitting}
                        onChange={(e) => field.onChange(e.target.checked ? [...field.value, t.id] : field.value.filter((id) => id !== t.id))}
                      />
                      <span className="font-medium">{t.name}</span>
                      <span className="num text-xs text-ink-soft">*.{t.fileExtension}</span>
                    </label>
                  ))}
                </fieldset>
              )}
            />
          </section>
        )}

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
