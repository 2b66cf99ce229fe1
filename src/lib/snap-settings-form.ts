import * as z from 'zod';
import { snapSettingsSchema, type SnapSettings } from '@shared/contracts/settings';

/**
 * Snap settings as a form holds them, and the schema that turns them back into `SnapSettings`.
 * Validation is `snapSettingsSchema` from shared/, plus a check that a named target group is
 * written as a Schoenflies symbol (the engine still decides whether it is a subgroup).
 */

/**
 * C1, Cs, Ci, Cn, Cnv, Cnh, Dn, Dnd, Dnh, Sn (n even), T, Td, Th, O, Oh, I, Ih, C∞v, D∞h.
 * Common practice for typed Schoenflies symbols; n is not bounded here.
 */
export const schoenfliesPattern = /^(?:C(?:[1-9]\d*[vh]?|s|i|∞v)|D(?:[2-9]\d*[dh]?|∞h)|S[2-9]\d*|T[dh]?|Oh?|Ih?)$/;

/** What a person typed → a symbol: trims, `inf`/`oo` → ∞, capital first letter, rest lower case. */
export function normaliseGroup(raw: string): string {
  const t = raw.trim().replace(/inf|oo/gi, '∞');
  return t.slice(0, 1).toUpperCase() + t.slice(1).toLowerCase();
}

/** The form's shape: the named-group text is kept while another target is chosen. */
export type SnapSettingsFormValues = Omit<SnapSettings, 'target'> & { target: { kind: SnapSettings['target']['kind']; group: string } };

/** Form values from settings (e.g. the workspace defaults). */
export function toFormSettings(settings: SnapSettings): SnapSettingsFormValues {
  return { ...settings, target: { kind: settings.target.kind, group: settings.target.kind === 'group' ? settings.target.group : '' } };
}

/** True unless a named target is not a Schoenflies symbol (reads raw values: other fields may be invalid). */
function isSchoenflies(settings: unknown): boolean {
  const target = (settings as { target?: { kind?: unknown; group?: unknown } } | null)?.target;
  if (target?.kind !== 'group') return true;
  const group = typeof target.group === 'string' ? target.group : '';
  const oddS = /^S\d+$/.test(group) && Number(group.slice(1)) % 2 !== 0;
  return schoenfliesPattern.test(group) && !oddS;
}

export const snapSettingsFormSchema = z.preprocess(
  (value) => {
    const v = value as { target?: { kind?: string; group?: string } } | undefined;
    if (v?.target?.kind === 'group') return { ...v, target: { kind: 'group', group: normaliseGroup(v.target.group ?? '') } };
    if (v?.target) return { ...v, target: { kind: v.target.kind } };
    return value;
  },
  snapSettingsSchema.refine((settings) => isSchoenflies(settings), {
    path: ['target', 'group'],
    message: 'Not a Schoenflies symbol',
    // Check the group even when other fields are wrong, so every message shows at once.
    when: () => true,
  }),
  // The preprocess step accepts the form's shape; say so for react-hook-form's resolver types.
) as unknown as z.ZodType<SnapSettings, SnapSettingsFormValues>;
