import * as z from 'zod';

/**
 * The per-structure result contract: what `pointfold snap --json` prints, what the worker stores
 * and what the API and the browser read. The field names listed in DESIGN.md ("The command line")
 * are relied on by other tools: never rename them.
 *
 * Units: lengths in Å, angles in radians unless a name says otherwise. Matrices are row-major
 * 3×3 arrays of 9 numbers acting on column vectors (x' = M x).
 */

/** One atom, coordinates in Å. */
export const atomSchema = z.object({
  element: z.string().min(1).max(3),
  x: z.number(),
  y: z.number(),
  z: z.number(),
});
export type AtomJson = z.infer<typeof atomSchema>;

/** Codes of the flags a structure can carry; `flagNotes` gives the human sentence for each. */
export const flagCodes = [
  'over-budget', // some atom moved more than the displacement budget
  'knife-edge', // the perceived group changes within a factor of 2 of the tolerance
  'charge-multiplicity', // charge and multiplicity contradict the electron count
  'close-contact', // two atoms closer than 0.5 Å
  'higher-symmetry', // snapped to a group the input supports only loosely: may be a saddle point
  'not-closed', // the operations found did not close into a group; the largest closed subgroup was used
  'target-not-subgroup', // a requested target could not be used; the perceived group was kept
] as const;
export const flagCodeSchema = z.enum(flagCodes);
export type FlagCode = z.infer<typeof flagCodeSchema>;

export const flagNoteSchema = z.object({ flag: flagCodeSchema, message: z.string() });

/** Kind of a symmetry operation. `improper` is Sn^k (k odd for n even…), `reflection` is σ = S1. */
export const operationKindSchema = z.enum(['identity', 'rotation', 'reflection', 'inversion', 'improper']);

export const operationSchema = z.object({
  /** Schoenflies-style label, plain text: `E`, `C3`, `C3^2`, `σh`, `σv`, `σd`, `i`, `S4`, `S4^3`. */
  symbol: z.string(),
  kind: operationKindSchema,
  /** n of Cn / Sn (1 for E and σ, 2 for i). */
  order: z.number().int(),
  /** k of Cn^k / Sn^k. */
  power: z.number().int(),
  /** Unit axis (rotation axis, plane normal); [0,0,0] for E and i. */
  axis: z.tuple([z.number(), z.number(), z.number()]),
  /** Row-major 3×3 matrix in the output frame. */
  matrix: z.array(z.number()).length(9),
  /** permutation[i] = index of the atom that atom i is carried onto. */
  permutation: z.array(z.number().int()),
  /** Largest distance (Å) between an atom's image and its partner, measured on the input geometry. */
  residual: z.number(),
});
export type OperationJson = z.infer<typeof operationSchema>;

export const symmetryElementsSchema = z.object({
  axes: z.array(
    z.object({
      order: z.number().int(),
      direction: z.tuple([z.number(), z.number(), z.number()]),
      /** Highest Sn (n) coincident with this axis, or null. */
      improperOrder: z.number().int().nullable(),
      principal: z.boolean(),
    }),
  ),
  planes: z.array(
    z.object({
      normal: z.tuple([z.number(), z.number(), z.number()]),
      kind: z.enum(['σh', 'σv', 'σd', 'σ']),
    }),
  ),
  inversionCentre: z.boolean(),
});

/** One merged range of the ladder: the group perceived for tolerances in [from, to). */
export const ladderRungSchema = z.object({
  group: z.string(),
  order: z.number().int(),
  fromTolerance: z.number(),
  toTolerance: z.number(),
  /** What snapping to this group would cost, Å. */
  displacementRmsd: z.number(),
  maxDisplacement: z.number(),
});
export type LadderRungJson = z.infer<typeof ladderRungSchema>;

/** The rigid transform applied: x_out = rotation · x_in + translation (Å). */
export const transformSchema = z.object({
  rotation: z.array(z.number()).length(9),
  translation: z.tuple([z.number(), z.number(), z.number()]),
});

export const structureResultSchema = z.object({
  name: z.string(),
  /** Hill order, e.g. `CH4`, `C6H6`, `ClH`, `H2O`. */
  formula: z.string(),
  /** The group of the output geometry (the chosen target), Schoenflies plain text. */
  pointGroup: z.string(),
  /** The group perceived on the input at `tolerance`. */
  perceivedGroup: z.string(),
  /** Order of `pointGroup`; for C∞v and D∞h, 0 (infinite). */
  order: z.number().int(),
  tolerance: z.number(),
  computationalSubgroup: z.string(),
  /** Where two non-equivalent maximal D2h-type subgroups exist (Td, D2d, D4d, D6d …), both. */
  computationalSubgroupAlternatives: z.array(z.string()),
  rotationalSymmetryNumber: z.number().int(),
  symmetryRmsdBefore: z.number(),
  symmetryRmsdAfter: z.number(),
  displacementRmsd: z.number(),
  maxDisplacement: z.number(),
  /** Continuous symmetry measure, 0–100 (size-normalized form). */
  csm: z.number(),
  flags: z.array(flagCodeSchema),
  flagNotes: z.array(flagNoteSchema),
  charge: z.number().int(),
  multiplicity: z.number().int(),
  /** Output atoms in the input's atom order. */
  atoms: z.array(atomSchema),
  /** Per-atom displacement (Å) after optimal superposition, input order. */
  displacements: z.array(z.number()),
  equivalenceClasses: z.array(z.array(z.number().int())),
  uniqueAtoms: z.array(z.number().int()),
  operations: z.array(operationSchema),
  elements: symmetryElementsSchema,
  ladder: z.array(ladderRungSchema),
  frame: z.enum(['standard', 'input']),
  transform: transformSchema,
  engineVersion: z.string(),
});
export type StructureResult = z.infer<typeof structureResultSchema>;
