import { zodResolver } from '@hookform/resolvers/zod';
import { FormProvider, useForm } from 'react-hook-form';
import type { SnapSettings } from '@shared/contracts/settings';
import { Button } from '@/components/ui/button';
import { SnapSettingsFields } from '@/components/ui/snap-settings-fields';
import { InlineError } from '@/components/ui/states';
import { snapSettingsFormSchema, toFormSettings, type SnapSettingsFormValues } from '@/lib/snap-settings-form';
import { useUpdateDefaults } from '../api/update-defaults';
import { SettingsSection } from './section';

/** The settings every new batch starts from (owners). */
export function DefaultsSection({ slug, defaults }: { slug: string; defaults: SnapSettings }) {
  const update = useUpdateDefaults(slug);
  const form = useForm<SnapSettingsFormValues, unknown, SnapSettings>({
    resolver: zodResolver(snapSettingsFormSchema),
    defaultValues: toFormSettings(defaults),
  });

  return (
    <SettingsSection id="defaults" title="Defaults for new batches" description="Each new batch starts from these; the chemist can change them per batch.">
      <FormProvider {...form}>
        <form
          noValidate
          aria-label="Defaults for new batches"
          className="flex flex-col gap-5 rounded-lg border border-rule bg-card p-5"
          onSubmit={form.handleSubmit((values) => update.mutate(values, { onSuccess: (w) => form.reset(toFormSettings(w.defaults)) }))}
        >
          <SnapSettingsFields prefix="" idPrefix="defaults" />
          {update.error && <InlineError>{update.error.message}</InlineError>}
          <div className="flex items-center gap-3">
            <Button type="submit" busy={update.isPending} disabled={!form.formState.isDirty}>
              Save defaults
            </Button>
            {update.isSuccess && !form.formState.isDirty && (
              <span role="status" className="text-sm text-moss">
                Saved.
              </span>
            )}
          </div>
        </form>
      </FormProvider>
    </SettingsSection>
  );
}
