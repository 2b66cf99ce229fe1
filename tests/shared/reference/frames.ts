/**
 * The point groups as explicit matrix groups in the standard frame of DESIGN.md, "The engine",
 * step 5 (principal axis on z; C2 on x for Dn/Dnd/Dnh; a mirror = xz for Cnv; mirror = xy for
 * Cs; C2 (T, Td, Th) or C4 (O, Oh) on x, y, z; C2 on x, y, z for I/Ih; Mulliken 1955 for planar
 * C2v/D2h, checked separately). Built here from textbook generators (Cotton 1990, ch. 3; memory)
 * and closed by multiplication, independently of the engine: a structure is in the standard
 * frame when every matrix of its group, about the origin, carries it onto itself.
 */
import { type Mat3, INVERSION, PHI, Z, closeGroup, improper, reflection, rotation } from './geometry';

const C = (axis: [number, number, number], n: number) => rotation(axis, (2 * Math.PI) / n);

/**
 * The matrix groups a structure of `group` may carry in the standard frame: one group, or two
 * for I and Ih (C2 on x, y, z leaves two frames, icosahedron vertices at (0, ±1, ±φ) or at
 * (0, ±φ, ±1)). Returns null for C∞v and D∞h (checked by "all atoms on z").
 */
export function standardGroups(group: string): Mat3[][] | null {
  if (group === 'C∞v' || group === 'D∞h') return null;
  const t = [C([0, 0, 1], 2), C([1, 0, 0], 2), C([1, 1, 1], 3)];
  const fixed: Record<string, Mat3[]> = {
    C1: [],
    Cs: [reflection(Z)],
    Ci: [INVERSION],
    T: t,
    Td: [...t, improper(Z, 4)],
    Th: [...t, INVERSION],
    O: [C([0, 0, 1], 4), C([1, 1, 1], 3)],
    Oh: [C([0, 0, 1], 4), C([1, 1, 1], 3), INVERSION],
  };
  if (fixed[group]) return [closeGroup(fixed[group])];
  if (group === 'I' || group === 'Ih') {
    return [[0, 1, PHI], [0, PHI, 1]].map((v) => {
      const gens = [C([0, 0, 1], 2), C([1, 1, 1], 3), C(v as [number, number, number], 5)];
      return closeGroup(group === 'Ih' ? [...gens, INVERSION] : gens);
    });
  }
  const m = /^([CDS])(\d+)([vhd]?)$/.exec(group);
  if (!m) throw new Error(`standardGroups: unknown group ${group}`);
  const [, family, nText, suffix] = m;
  const n = Number(nText);
  const cn = C([0, 0, 1], n);
  const c2x = C([1, 0, 0], 2);
  const gens: Mat3[] = (() => {
    if (family === 'S') return [improper(Z, n)];
    if (family === 'C' && suffix === '') return [cn];
    if (family === 'C' && suffix === 'v') return [cn, reflection([0, 1, 0])];
    if (family === 'C' && suffix === 'h') return [cn, reflection(Z)];
    if (family === 'D' && suffix === '') return [cn, c2x];
    if (family === 'D' && suffix === 'd') return [improper(Z, 2 * n), c2x];
    if (family === 'D' && suffix === 'h') return [cn, c2x, reflection(Z)];
    throw new Error(`standardGroups: unknown group ${group}`);
  })();
  return [closeGroup(gens)];
}

