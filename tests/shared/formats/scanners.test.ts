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
import { normalizeElement } from '@shared/elements';
import { parseNumber, splitFields } from '@shared/formats/common';
import { KEY_VALUE, readXyz } from '@shared/formats/xyz';

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

/**
 * readXyz reads the common atom line (`El x y z`, plain decimals) by a one-pass scan with its own
 * decimal conversion. Whatever the line, the atoms it gives must be those of the plain
 * definition: fields by trim + split, the element by normalizeElement, each coordinate by
 * Number() (ECMA-262 StringToNumber) — compared with Object.is, so −0 and the last bit count.
 */
describe('XYZ atom lines', () => {
  const referenceAtom = (line: string) => {
    const t = reference(line);
    const element = normalizeElement(t[0]);
    const xyz = t.slice(1, 4).map((s) => parseNumber(s));
    if (t.length < 4 || element == null || xyz.some((v) => v == null || !Number.isFinite(v) || Math.abs(v) > 1e6)) return null;
    return { element, x: xyz[0]!, y: xyz[1]!, z: xyz[2]! };
  };
  const readLine = (line: string) => {
    const [r] = readXyz('t.xyz', `1\nt\n${line}\n`);
    return r.ok ? r.molecule.atoms[0] : null;
  };
  const same = (a: { element: string; x: number; y: number; z: number } | null, b: typeof a) =>
    a === null || b === null ? a === b : a.element === b.element && Object.is(a.x, b.x) && Object.is(a.y, b.y) && Object.is(a.z, b.z);

  it.each([
    ['C 0.0 1.5 -2.25'],
    ['  cl\t-0.0\t+.5 7.'],
    ['6 1.234567890123456 -9.87654321012345 0.000000000000001'],
    ['O 1.2345678901234567 2 3'],
    ['N 1e-3 2 3 extra columns'],
    ['Fe 999999.999999 -1000000 1000000.0000001'],
    ['H 0.1 0.2 0.3\r'],
    ['Xx 0 0 0'],
    ['C 1 2'],
    ['C\u000b1 2 3'],
    ['C 1 2 3 \u00e9'],
  ])('%j', (line) => {
    expect(same(readLine(line), referenceAtom(line))).toBe(true);
  });

  it('agrees with the plain definition on random lines', () => {
    const digits = (max: number) => fc.stringMatching(new RegExp(`^[0-9]{0,${max}}$`));
    const decimal = fc
      .tuple(fc.constantFrom('', '-', '+'), digits(9), fc.constantFrom('', '.'), digits(12), fc.constantFrom('', 'e-3', 'E+2', 'x'))
      .map(([s, a, dot, b, e]) => `${s}${a}${dot}${b}${e}`);
    const element = fc.constantFrom('C', 'c', 'CL', 'Cl', 'h', '6', '17', '118', '0', 'Q', 'Og', 'he');
    const gap = fc.constantFrom(' ', '  ', '\t', ' \t ');
    fc.assert(
      fc.property(gap, element, gap, decimal, gap, decimal, gap, decimal, fc.constantFrom('', ' ', ' 1 2', '\t-'), (...parts) => {
        const line = parts.join('');
        expect(same(readLine(line), referenceAtom(line))).toBe(true);
      }),
      { seed: 2026, numRuns: 3000 },
    );
  });
});

describe('the key=value pattern of XYZ comment lines', () => {
  // Reference: the same pattern without the look-behind (what the reader used before it was
  // made linear in the line's length); on any text both must find the same keys, values and places.
  const plain = /([A-Za-z_][\w\-]*)\s*=\s*("(?:[^"\\]|\\.)*"|'[^']*'|\{[^}]*\}|[^\s"']+)/g;
  const found = (re: RegExp, s: string) => [...s.matchAll(re)].map((m) => [m.index, m[0], m[1], m[2]]);

  it('finds what the plain pattern finds', () => {
    const piece = fc.constantFrom('a', 'b', '_', '1', '-', '=', '"', "'", ' ', '{', '}', '\\', 'x=', 'charge', '=1', ' q="v w"', 'mult=2');
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 16 }), (parts) => {
        const s = parts.join('');
        expect(found(KEY_VALUE, s)).toEqual(found(plain, s));
      }),
      { seed: 5, numRuns: 3000 },
    );
  });
});
