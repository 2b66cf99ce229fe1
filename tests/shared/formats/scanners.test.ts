/**
 * The readers' character scanners against the plain definitions they replace on the hot path:
 * - the field splitter must split exactly like `line.trim().split(/\s+/)` (the ECMAScript
 *   definition of white space and String.prototype.split, ECMA-262 §22.1.3.32 and §12.2);
 * - parseNumber must accept exactly the decimal grammar [+-]?(d+.?d*|.d+)([eE][+-]?d+)? (plus
 *   Fortran D exponents, and nan/inf as NaN) and give Number()'s value.
 * Checked on random strings and hand-picked ones.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseNumber, splitFields } from '@shared/formats/common';

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

/** The definition parseNumber implements (its earlier, regex-only form). */
function referenceNumber(token: string): number | null {
  const t = token.trim();
  if (/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return Number(t);
  if (/^[+-]?(\d+\.?\d*|\.\d+)[dD][+-]?\d+$/.test(t)) return Number(t.replace(/[dD]/, 'e'));
  if (/^[+-]?(nan|inf|infinity)$/i.test(t)) return Number.NaN;
  return null;
}

describe('parseNumber', () => {
  it.each([
    ['1.25'], ['-0.5e-3'], ['+3'], ['5.'], ['.5'], ['.'], ['-'], ['1e'], ['1e+'], ['1.2.3'], ['0x1A'], ['1_000'],
    [' 2.5 '], ['1.5D-3'], ['NaN'], ['-inf'], ['Infinity'], [''], ['e5'], ['1e5x'], ['12345678901234567890'],
  ])('%j', (token) => {
    expect(parseNumber(token)).toEqual(referenceNumber(token));
  });

  it('agrees with the regular-expression definition on random tokens', () => {
    const ch = fc.constantFrom('0', '1', '7', '9', '.', 'e', 'E', '+', '-', 'd', 'x', ' ');
    fc.assert(
      fc.property(fc.array(ch, { maxLength: 10 }), (chars) => {
        const token = chars.join('');
        expect(parseNumber(token)).toEqual(referenceNumber(token));
      }),
      { seed: 78, numRuns: 3000 },
    );
  });
});
