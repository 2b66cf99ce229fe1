import { z } from 'zod';
import { snapSettingsSchema, type SnapSettings } from '@shared/contracts/settings';

/**
 * A Schoenflies symbol as typed by a person: C1, Cs, Ci, Cn, Cnv, Cnh, Dn, Dnd, Dnh, S2n, T, Td,
 * Th, O, Oh, I, Ih, C∞v, D∞h (`inf` accepted for ∞). The engine decides whether it is a subgroup
 * of what it perceives; this only catches typos before upload.
 */
export const schoenfliesPattern = /^(?:C(?:[1-9]\d*[vh]?|s|i|∞v)|D(?:[2-9]\d*[dh]?|∞h)|S[2-9]\d*|T[dh]?|Oh?|Ih?)$/;

/** Normalises what a person typed: trims, `inf`/`oo` → ∞, first letter upper case. */
export function normaliseGroup(raw: string): string {
  const t = raw.trim().replace(/inf|oo/gi, '∞');
  return t.slice(0, 1).toUpperCase() + t.slice(1).toLowerCase();
}

const settingsWithGroupCheck = snapSettingsSchema.superRefine((settings, ctx) => {
  if (settings.target.kind === 'group' && !schoenfliesPattern.test(settings.target.group)) {
    ctx.addIssue({ code: 'custom', path: ['target', 'group'], message: 'Not a Schoenflies symbol' });
  }
  if (settings.target.kind === 'group' && /^S\d+$/.test(settings.target.group) && Number(settings.target.group.slice(1)) % 2 !== 0) {
    ctx.addIssue({ code: 'custom', path: ['target', 'group'], message: 'Sn needs an even n' });
  }
});

/** The new-batch form: a name, the files, and the snap settings (validated by the shared schema). */
export const newBatchFormSchema = z.object({
  name: z.string().trim().max(200),
  files: z.array(z.instanceof(File)).min(1),
  settings: z.preprocess((value) => {
    // The named-group field keeps its text while another target is chosen; send only what applies.
    const v = value as { target?: { kind?: string; group?: string } } | undefined;
    if (v?.target?.kind === 'group') return { ...v, target: { kind: 'group', group: normaliseGroup(v.target.group ?? '') } };
    if (v?.target) return { ...v, target: { kind: v.target.kind } };
    return value;
  }, settingsWithGroupCheck),
});

export type NewBatchFormInput = {
  name: string;
  files: File[];
  settings: Omit<SnapSettings, 'target' | 'multiplicity'> & { target: { kind: string; group?: string }; multiplicity: number | null };
};
export type NewBatchValues = { name: string; files: File[]; settings: SnapSettings };

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
