import type { AtomJson, FlagCode, LadderRungJson, OperationJson, StructureResult } from '../contracts/structure';
import { analyse, groupAt } from './analysis';
import { perceptionNotes } from './flag-notes';
import { EngineError } from './errors';
import { fitGroup } from './fit-frame';
import { groupOrder } from './groups';
import { mul3, transpose3 } from './mat3';
import { prepareMolecule } from './molecule';
import { describe, equivalenceClasses, orientFit } from './describe';
import { ladderJson } from './report';

/** What {@link perceive} returns: the group at one tolerance, in the input frame. */
export interface Perception {
  pointGroup: string;
  /** |G|; 0 for C∞v, D∞h and Kh. */
  order: number;
  tolerance: number;
  /** Operations of the fitted group in the input frame centred at the centre of mass. */
  operations: OperationJson[];
  elements: StructureResult['elements'];
  equivalenceClasses: number[][];
  uniqueAtoms: number[];
  flags: FlagCode[];
  flagNotes: StructureResult['flagNotes'];
}

/**
 * The point group of a structure at `tolerance` Å (default 0.01): the largest distance allowed
 * between an atom's image under an operation and its partner atom of the same element. Reports
 * every operation (matrix, permutation, residual), the symmetry elements and the classes of
 * equivalent atoms, in the input frame (centred at the centre of mass). Flags: 'not-closed',
 * 'knife-edge', 'close-contact'. @throws EngineError for unusable input.
 */
export function perceive(atoms: readonly AtomJson[], options?: { tolerance?: number }): Perception {
  const tol = checkedTolerance(options?.tolerance ?? 0.01);
  const mol = prepareMolecule(atoms);
  const a = analyse(mol, 2 * tol);
  const found = groupAt(a, tol);
  const o = orientFit(a, fitGroup(a, found));
  const { operations, elements } = describe(o, mul3(o.fit.Q, transpose3(o.S)));
  const classes = equivalenceClasses(mol.n, o.fit.perms);
  const notes = perceptionNotes(a, found, tol);
  return {
    pointGroup: found.name,
    order: groupOrder(found.name),
    tolerance: tol,
    operations,
    elements,
    equivalenceClasses: classes,
    uniqueAtoms: classes.map((c) => c[0]),
    flags: notes.map((f) => f.flag),
    flagNotes: notes,
  };
}

/**
 * Just the Schoenflies name of the group perceived at `tolerance` Å — what {@link perceive}
 * reports as pointGroup, without fitting, orienting or describing it (the write-back check
 * needs only this). @throws EngineError for unusable input.
 */
export function pointGroupAt(atoms: readonly AtomJson[], tolerance: number): string {
  const tol = checkedTolerance(tolerance);
  return groupAt(analyse(prepareMolecule(atoms), 2 * tol), tol).name;
}

/** A perception tolerance (Å), which must lie in (0, 1]. @throws EngineError('bad-settings'). */
function checkedTolerance(tol: number): number {
  if (!(tol > 0) || tol > 1) throw new EngineError('bad-settings', `tolerance ${tol} Å is outside (0, 1] Å`);
  return tol;
}

/**
 * The ladder: the group perceived at each of 24 log-spaced tolerances from 1e-4 to 0.3 Å, merged
 * into ranges [fromTolerance, toTolerance) with exact change points, each with the displacement
 * RMSD and maximum (Å, after optimal superposition) that snapping to it would cost.
 * @throws EngineError for unusable input.
 */
export function ladder(atoms: readonly AtomJson[]): LadderRungJson[] {
  const mol = prepareMolecule(atoms);
  return ladderJson(analyse(mol), new Map());
}
