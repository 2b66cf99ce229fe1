import { beforeAll, describe, expect, it } from 'vitest';
import type { StructureResult } from '@shared/contracts/structure';
import { snap } from '@shared/engine';
import { BOHR_IN_ANGSTROM, renderTemplate, TEMPLATE_PLACEHOLDERS, validateTemplate } from '@shared/formats';

/**
 * Export templates, on a real snap of water built from the handbook geometry
 * r(OH) 0.9578 Å, ∠HOH 104.4776° (NIST CCCBDB, SRD 101, citing Hoy & Bunker 1979; reference
 * molecule #6 in the project's reference list). Expected coordinates are derived here from that
 * geometry, not read back from the engine.
 */

const R_OH = 0.9578; // Å, NIST CCCBDB
const HALF_ANGLE = ((104.4776 / 2) * Math.PI) / 180; // ∠HOH / 2, NIST CCCBDB
const Y_H = R_OH * Math.sin(HALF_ANGLE); // half the H···H distance
const DZ_OH = R_OH * Math.cos(HALF_ANGLE); // height of O above the H···H line
// Centre of mass with IUPAC abridged standard atomic weights H 1.008, O 15.999 (CIAAW 2021).
const Z_O = (2 * 1.008 * DZ_OH) / (15.999 + 2 * 1.008);

let water: StructureResult;
beforeAll(() => {
  water = snap({
    name: 'water',
    sourceFile: 'water.xyz',
    frameIndex: 0,
    atoms: [
      { element: 'O', x: 0, y: 0, z: 0 },
      { element: 'H', x: 0, y: Y_H, z: DZ_OH },
      { element: 'H', x: 0, y: -Y_H, z: DZ_OH },
    ],
    charge: 0,
    multiplicity: null,
  });
});

/** Rows of `El x y z` parsed back from rendered geometry lines. */
function rows(text: string): { element: string; xyz: number[]; decimals: number[] }[] {
  return text
    .trim()
    .split('\n')
    .map((line) => {
      const [element, ...coords] = line.trim().split(/\s+/);
      return { element, xyz: coords.map(Number), decimals: coords.map((c) => c.split('.')[1]?.length ?? 0) };
    });
}

describe('renderTemplate', () => {
  it('fills the scalar placeholders of water: C2v (CCCBDB), computational subgroup C2v, neutral singlet', () => {
    const deck = renderTemplate('# {{name}} {{formula}}\n{{charge}} {{multiplicity}}\nsym {{ group }}/{{subgroup}}/{{perceivedGroup}} n={{natoms}} u={{nunique}}', water);
    expect(deck).toBe('# water H2O\n0 1\nsym C2v/C2v/C2v n=3 u=2');
  });

  it('writes the snapped geometry in Å with 10 decimals, in the standard frame (principal axis on z, plane yz)', () => {
    const g = rows(renderTemplate('{{geometry}}', water));
    expect(g.map((r) => r.element)).toEqual(['O', 'H', 'H']);
    for (const r of g) expect(r.decimals).toEqual([10, 10, 10]);
    // Bond length and angle survive: |y_H| = r sin(θ/2), z_O − z_H = r cos(θ/2) (to the 10th decimal).
    expect(Math.abs(g[1].xyz[1])).toBeCloseTo(Y_H, 9);
    expect(g[2].xyz[1]).toBeCloseTo(-g[1].xyz[1], 10);
    expect(g[0].xyz[2] - g[1].xyz[2]).toBeCloseTo(DZ_OH, 9);
    // Centre of mass at the origin (IUPAC weights; the engine's weights may differ in the 4th
    // significant figure of H, hence 1e-5 Å).
    expect(Math.abs(g[0].xyz[2] - Z_O)).toBeLessThan(1e-5);
    for (const r of g) expect(r.xyz[0]).toBe(0);
  });

  it('writes the geometry in bohr with the CODATA 2018 Bohr radius', () => {
    expect(BOHR_IN_ANGSTROM).toBe(0.529177210903); // CODATA 2018, NIST
    const a = rows(renderTemplate('{{geometry}}', water));
    const b = rows(renderTemplate('{{geometryBohr}}', water));
    expect(Math.abs(b[1].xyz[1])).toBeCloseTo(Y_H / 0.529177210903, 9);
    for (let i = 0; i < 3; i++) for (let k = 0; k < 3; k++) expect(b[i].xyz[k]).toBeCloseTo(a[i].xyz[k] / 0.529177210903, 9);
  });

  it('writes only the symmetry-unique atoms for uniqueGeometry: O and one H in C2v', () => {
    const u = rows(renderTemplate('{{uniqueGeometry}}', water));
    expect(u.map((r) => r.element)).toEqual(['O', 'H']);
    expect(Math.abs(u[1].xyz[1])).toBeCloseTo(Y_H, 9);
  });

  it('takes the charge and multiplicity of the result (a cation doublet) and a name override', () => {
    const cation = { ...water, charge: 1, multiplicity: 2 };
    expect(renderTemplate('{{charge}} {{multiplicity}} {{name}}', cation, { name: 'water-cation' })).toBe('1 2 water-cation');
  });

  it('copies the text around placeholders unchanged and leaves unknown placeholders as written', () => {
    const body = 'line one\n  {{nope}} keep {{charge}}\n$end\n';
    expect(renderTemplate(body, water)).toBe('line one\n  {{nope}} keep 0\n$end\n');
  });
});

describe('validateTemplate', () => {
  it('accepts every documented placeholder', () => {
    const body = Object.keys(TEMPLATE_PLACEHOLDERS).map((k) => `{{${k}}}`).join('\n');
    expect(validateTemplate(body)).toEqual([]);
  });

  it('lists unknown placeholders once each, in order of first use', () => {
    expect(validateTemplate('{{chrage}} {{geometry}} {{Group}} {{chrage}}')).toEqual(['chrage', 'Group']);
  });

  it('reports an unclosed placeholder', () => {
    expect(validateTemplate('charge {{charge}\nend')).toEqual(['{{charge}']);
  });

  it('reports empty braces', () => {
    expect(validateTemplate('x {{ }} y')).toEqual(['']);
  });
});
