import * as z from 'zod';

/** Output formats a batch can write. `unique` = symmetry-unique atoms with the group. */
export const outputFormats = ['xyz', 'extxyz', 'mol', 'qcschema', 'unique'] as const;
export const outputFormatSchema = z.enum(outputFormats);
export type OutputFormat = z.infer<typeof outputFormatSchema>;

/** Which group a structure is snapped to. */
export const targetPolicySchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('perceived') }),
  z.object({ kind: z.literal('computational') }),
  z.object({ kind: z.literal('group'), group: z.string().min(1).max(8) }),
]);
export type TargetPolicy = z.infer<typeof targetPolicySchema>;

/** Snap settings shared by the CLI, the batch form, the API and the worker. Å throughout. */
export const snapSettingsSchema = z.object({
  tolerance: z.number().positive().max(1).default(0.01),
  target: targetPolicySchema.default({ kind: 'perceived' }),
  frame: z.enum(['standard', 'input']).default('standard'),
  displacementBudget: z.number().positive().max(5).default(0.05),
  /** Used where the file carries none. */
  charge: z.number().int().min(-20).max(20).default(0),
  /** Used where the file carries none; null = lowest consistent with the electron count. */
  multiplicity: z.number().int().min(1).max(20).nullable().default(null),
  outputFormats: z.array(outputFormatSchema).min(1).default(['xyz', 'qcschema']),
});
export type SnapSettings = z.infer<typeof snapSettingsSchema>;
