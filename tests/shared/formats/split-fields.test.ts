/**
 * The XYZ reader's field splitter must split exactly like `line.trim().split(/\s+/)` (the
 * ECMAScript definition of white space and String.prototype.split, ECMA-262 §22.1.3.32 and
 * §12.2), which it replaces on the hot path. Checked on random lines of fields, tabs, CRs,
 * form feeds and non-ASCII spaces, and on a few hand-picked ones.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { splitFields } from '@shared/formats/common';

const reference = (line: string) => line.trim().split(/\s+/);

describe('splitFields', () => {
  it.each([
    ['C 0.0 1.5 -2.25'],
    ['   H\t0\t0\t0.74  '],
    ['O 1 2 3\r'],
    [''],
    ['   '],
    ['N\u00a01 2 3'],
    ['\ufeffCl 1e-3 -1E+2 .5'],
    ['x\u000by\u000cz'],
  ])('%j', (line) => {
    expect(splitFields(line)).toEqual(reference(line));
  });

  it('agrees with trim + split on random lines', () => {
    const piece = fc.constantFrom(' ', '  ', '\t', '\r', '\f', '\v', 'C', 'Cl', '1.25', '-0.5e-3', '\u00a0', '\u2003', 'x');
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 12 }), (parts) => {
        const line = parts.join('');
        expect(splitFields(line)).toEqual(reference(line));
      }),
      { seed: 77, numRuns: 400 },
    );
  });
});
