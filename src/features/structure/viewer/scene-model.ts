import type { AtomJson, StructureResult } from '@shared/contracts/structure';
import { arrowScale, displacementArrows, type Arrow } from './arrows';
import { applyTransform, centreOfMass, extent, perceiveBonds, type Transform, type Vec3 } from './geometry';

/** Displacements shorter than this (Å) get no arrow: numerically zero after a snap of an already exact geometry. */
export const MIN_ARROW = 1e-6;

/** What the 3D view shows, computed once from a structure (pure: no three.js). */
export interface SceneModel {
  atoms: AtomJson[];
  bonds: Array<[number, number]>;
  /** Input atoms brought into the output frame with result.transform (before/after overlay). */
  aligned: AtomJson[];
  arrows: Arrow[];
  /** Arrows are drawn this many times their true length. */
  arrowScale: number;
  centre: Vec3;
  /** Largest distance of an atom from the centre, Å (≥ 1). */
  radius: number;
  elements: StructureResult['elements'];
  /** Element symbols present, in order of first appearance. */
  symbols: string[];
}

/** Builds the scene model from the output atoms, the input atoms and the transform between them. */
export function buildSceneModel(
  result: Pick<StructureResult, 'atoms' | 'elements' | 'maxDisplacement'> & { transform: Transform },
  inputAtoms: readonly AtomJson[],
): SceneModel {
  const atoms = result.atoms;
  const aligned = inputAtoms.length === atoms.length ? applyTransform(inputAtoms, result.transform) : [];
  // Scale from the arrows actually drawn (aligned input → output), so the longest one is visible.
  // Below MIN_ARROW Å there is nothing a chemist could see or care about: no arrows, factor 1.
  const raw = displacementArrows(aligned, atoms, 1, MIN_ARROW);
  const longest = raw.reduce((m, a) => Math.max(m, a.length), 0);
  const scale = raw.length ? arrowScale(longest) : 1;
  const centre = centreOfMass(atoms);
  return {
    atoms,
    bonds: perceiveBonds(atoms),
    aligned,
    arrows: displacementArrows(aligned, atoms, scale, MIN_ARROW),
    arrowScale: scale,
    centre,
    radius: extent(atoms, centre),
    elements: result.elements,
    symbols: [...new Set(atoms.map((a) => a.element))],
  };
}

/** Whether this browser can draw WebGL (false in jsdom, on blocked GPUs, in some locked-down browsers). */
export function hasWebGL(): boolean {
  try {
    if (typeof document === 'undefined' || typeof window === 'undefined' || !('WebGLRenderingContext' in window)) return false;
    const canvas = document.createElement('canvas');
    return Boolean(canvas.getContext('webgl2') ?? canvas.getContext('webgl'));
  } catch {
    return false;
  }
}
