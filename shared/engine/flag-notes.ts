import type { FlagCode } from '../contracts/structure';
import { groupAt, type Analysis, type FoundGroup } from './analysis';

/** One flag with its human sentence. */
export interface FlagNote {
  flag: FlagCode;
  message: string;
}

/** A length or tolerance for a sentence: 2 significant digits, exponent below 1e-3 Å. */
export function formatLength(x: number): string {
  return x === 0 ? '0' : x < 1e-3 ? x.toExponential(1) : String(Number(x.toPrecision(2)));
}

/**
 * The flags that perception alone can raise, shared by `perceive` and `snap`:
 * 'knife-edge' (the group at tol/2 or 2·tol differs), 'close-contact' (atoms < 0.5 Å) and
 * 'not-closed' (found operations that would not close into a group were left out).
 */
export function perceptionNotes(a: Analysis, found: FoundGroup, tol: number): FlagNote[] {
  const notes: FlagNote[] = [];
  const half = groupAt(a, tol / 2).name;
  const twice = groupAt(a, tol * 2).name;
  if (half !== found.name || twice !== found.name) {
    notes.push({
      flag: 'knife-edge',
      message: `The perceived group depends on the tolerance: ${half} at ${formatLength(tol / 2)} Å, ${found.name} at ${formatLength(tol)} Å, ${twice} at ${formatLength(2 * tol)} Å.`,
    });
  }
  const c = a.mol.closeContact;
  if (c) {
    notes.push({ flag: 'close-contact', message: `Atoms ${c.i + 1} and ${c.j + 1} are only ${formatLength(c.distance)} Å apart.` });
  }
  if (found.notClosed) {
    notes.push({
      flag: 'not-closed',
      message: `Some operations found within ${formatLength(tol)} Å do not combine into a group; the largest closed group, ${found.name}, was used.`,
    });
  }
  return notes;
}
