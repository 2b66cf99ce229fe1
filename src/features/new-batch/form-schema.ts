import * as z from 'zod';
import type { SnapSettings } from '@shared/contracts/settings';
import { snapSettingsFormSchema, type SnapSettingsFormValues } from '@/lib/snap-settings-form';

/** The new-batch form: a name, the files, and the snap settings. */
export const newBatchFormSchema = z.object({
  name: z.string().trim().max(200),
  files: z.array(z.instanceof(File)).min(1),
  settings: snapSettingsFormSchema,
  /** Export templates to render per structure into the batch ZIP (ids, in the order chosen). */
  templateIds: z.array(z.string()),
});

export type NewBatchFormInput = { name: string; files: File[]; settings: SnapSettingsFormValues; templateIds: string[] };
export type NewBatchValues = { name: string; files: File[]; settings: SnapSettings; templateIds: string[] };

export const newBatchMessages = {
  files: 'Add at least one file or ZIP.',
  name: 'Keep the name under 200 characters.',
};

/** A batch name from its files when none was typed: `ligands` or `ligands + 4 more`. */
export function suggestName(files: readonly File[]): string {
  if (files.length === 0) return '';
  const first = files[0].name.replace(/\.[^.]+$/, '');
  return files.length === 1 ? first : `${first} + ${files.length - 1} more`;
}
