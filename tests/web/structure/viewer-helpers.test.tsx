import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render, screen } from '@testing-library/react';
import { ELEMENT_SYMBOLS } from '@shared/elements';
import { arrowScale, displacementArrows } from '@/features/structure/viewer/arrows';
import {
  contrastRatio,
  elementColour,
  MIN_ATOM_CONTRAST,
  tablePosition,
  VIEWER_BACKGROUND,
} from '@/features/structure/viewer/element-colours';
import { axisPattern, dashSegments } from '@/features/structure/viewer/element-style';
import { applyTransform, centreOfMass, perceiveBonds } from '@/features/structure/viewer/geometry';
import { buildSceneModel } from '@/features/structure/viewer/scene-model';
import { ViewerPanel } from '@/features/structure/viewer/viewer-panel';
import { resultFixture } from './ui-fixtures';

const close = (a: number, b: number, tol: number) => Math.abs(a - b) <= tol;

// Water: r(OH) = 0.9572 Å, ∠HOH = 104.52° — the experimental equilibrium geometry as listed in
// NIST CCCBDB (values from memory). Placed in the yz plane, C2 along z.
const half = (104.52 / 2) * (Math.PI / 180);
const water = [
  { element: 'O', x: 0, y: 0, z: 0 },
  { element: 'H', x: 0, y: 0.9572 * Math.sin(half), z: -0.9572 * Math.cos(half) },
  { element: 'H', x: 0, y: -0.9572 * Math.sin(half), z: -0.9572 * Math.cos(half) },
];
// Methane: r(CH) = 1.087 Å (NIST CCCBDB experimental, from memory), H on alternate cube corners.
const ch = 1.087 / Math.sqrt(3);
const methane = [
  { element: 'C', x: 0, y: 0, z: 0 },
  { element: 'H', x: ch, y: ch, z: ch },
  { element: 'H', x: -ch, y: -ch, z: ch },
  { element: 'H', x: -ch, y: ch, z: -ch },
  { element: 'H', x: ch, y: -ch, z: -ch },
];
// Benzene: r(CC) = 1.397 Å, r(CH) = 1.084 Å (gas-phase electron diffraction as quoted in NIST CCCBDB, from memory).
const benzene = Array.from({ length: 6 }, (_, k) => {
  const t = (k * Math.PI) / 3;
  return [
    { element: 'C', x: 1.397 * Math.cos(t), y: 1.397 * Math.sin(t), z: 0 },
    { element: 'H', x: (1.397 + 1.084) * Math.cos(t), y: (1.397 + 1.084) * Math.sin(t), z: 0 },
  ];
}).flat();

describe('bond perception (d < rA + rB + 0.45 Å, Cordero 2008 radii)', () => {
  it('bonds O to both H in water and leaves H···H (1.51 Å) unbonded', () => {
    expect(perceiveBonds(water)).toEqual([
      [0, 1],
      [0, 2],
    ]);
  });

  it('finds the four C–H bonds of methane and no H···H bond (1.775 Å)', () => {
    expect(perceiveBonds(methane)).toEqual([
      [0, 1],
      [0, 2],
      [0, 3],
      [0, 4],
    ]);
  });

  it('finds the 12 bonds of benzene: a six-membered C ring and six C–H', () => {
    const bonds = perceiveBonds(benzene);
    expect(bonds).toHaveLength(12);
    const cc = bonds.filter(([i, j]) => benzene[i].element === 'C' && benzene[j].element === 'C');
    expect(cc).toHaveLength(6);
  });

  it('treats two atoms closer than 0.1 Å as overlapping, not bonded, and never bonds a dummy atom', () => {
    expect(perceiveBonds([{ element: 'C', x: 0, y: 0, z: 0 }, { element: 'C', x: 0.05, y: 0, z: 0 }])).toEqual([]);
    expect(perceiveBonds([{ element: 'C', x: 0, y: 0, z: 0 }, { element: 'X', x: 1, y: 0, z: 0 }])).toEqual([]);
  });

  it('uses the grid without losing bonds across cell borders (a long carbon chain)', () => {
    const chain = Array.from({ length: 60 }, (_, i) => ({ element: 'C', x: i * 1.54, y: 0.3 * (i % 2), z: 0 }));
    expect(perceiveBonds(chain)).toHaveLength(59);
  });
});

describe('arrow scaling', () => {
  it('picks a 1–2–5 factor that draws the longest displacement near 0.8 Å, never shrinking', () => {
    expect(arrowScale(0.001)).toBe(500); // 0.8/0.001 = 800 → 500
    expect(arrowScale(0.004)).toBe(200); // 200 exactly
    expect(arrowScale(0.00003)).toBe(20000); // 26 667 → 20 000
    expect(arrowScale(0.5)).toBe(1);
    expect(arrowScale(0)).toBe(1);
    expect(arrowScale(Number.NaN)).toBe(1);
  });

  it('draws each arrow from the aligned input atom along its true displacement times the factor', () => {
    const input = [{ element: 'H', x: 0, y: 0, z: 0 }, { element: 'H', x: 1, y: 0, z: 0 }];
    const output = [{ element: 'H', x: 0.001, y: 0, z: 0 }, { element: 'H', x: 1, y: 0, z: 0 }];
    const arrows = displacementArrows(input, output, 500);
    expect(arrows).toHaveLength(1); // the atom that did not move gets none
    expect(arrows[0].atom).toBe(0);
    expect(close(arrows[0].to[0], 0.5, 1e-12)).toBe(true);
    expect(close(arrows[0].length, 0.001, 1e-15)).toBe(true);
  });
});

describe('frames and the scene model', () => {
  it('applies x′ = R x + t with R row-major acting on column vectors (90° about z)', () => {
    const [p] = applyTransform([{ element: 'C', x: 1, y: 0, z: 0 }], { rotation: [0, -1, 0, 1, 0, 0, 0, 0, 1], translation: [0, 0, 2] });
    expect([p.x, p.y, p.z].map((v) => Math.round(v * 1e12) / 1e12)).toEqual([0, 1, 2]);
  });

  it('puts the centre of mass of water on the O side of the H–H midpoint (IUPAC 2021 weights)', () => {
    const c = centreOfMass(water);
    // z_com = 2·m_H·z_H / (m_O + 2·m_H) with m_H = 1.008, m_O = 15.999 (IUPAC conventional weights).
    const expected = (2 * 1.008 * water[1].z) / (15.999 + 2 * 1.008);
    expect(close(c[2], expected, 1e-9)).toBe(true);
  });

  it('brings the input into the output frame and scales the arrows from the arrows actually drawn', () => {
    const result = resultFixture();
    const input = result.atoms.map((a, i) => ({ ...a, x: a.x + (i === 1 ? 0.002 : 0) }));
    const model = buildSceneModel(result, input);
    expect(model.aligned).toHaveLength(4);
    expect(model.arrowScale).toBe(200); // 0.8 / 0.002 = 400 → 200
    expect(model.arrows).toHaveLength(1);
    expect(model.bonds).toHaveLength(3);
    expect(model.symbols).toEqual(['N', 'H']);
  });
});

describe('Pointfold element colours', () => {
  it('places elements as the IUPAC periodic table does (periods, groups, f-block)', () => {
    expect(tablePosition(1)).toEqual({ period: 1, group: 1, fIndex: null });
    expect(tablePosition(2)).toEqual({ period: 1, group: 18, fIndex: null });
    expect(tablePosition(8)).toEqual({ period: 2, group: 16, fIndex: null });
    expect(tablePosition(17)).toEqual({ period: 3, group: 17, fIndex: null });
    expect(tablePosition(26)).toEqual({ period: 4, group: 8, fIndex: null }); // Fe
    expect(tablePosition(57)).toEqual({ period: 6, group: null, fIndex: 0 }); // La
    expect(tablePosition(71)).toEqual({ period: 6, group: null, fIndex: 14 }); // Lu
    expect(tablePosition(72)).toEqual({ period: 6, group: 4, fIndex: null }); // Hf
    expect(tablePosition(118)).toEqual({ period: 7, group: 18, fIndex: null }); // Og
  });

  it('computes WCAG contrast like the specification (black on white is 21:1, #777 on white about 4.48:1)', () => {
    expect(close(contrastRatio('#000000', '#ffffff'), 21, 1e-9)).toBe(true);
    // 4.48:1 is the value commonly quoted for #777777 on white (WebAIM contrast checker, from memory).
    expect(close(contrastRatio('#777777', '#ffffff'), 4.48, 0.01)).toBe(true);
  });

  it('gives every element H–Og at least 3:1 contrast with the view background (WCAG 1.4.11)', () => {
    for (const symbol of ELEMENT_SYMBOLS) {
      expect(contrastRatio(elementColour(symbol), VIEWER_BACKGROUND), symbol).toBeGreaterThanOrEqual(MIN_ATOM_CONTRAST);
    }
  });

  it('tells the common organic elements apart (pairwise RGB distance ≥ 60 of 441)', () => {
    const common = ['H', 'C', 'N', 'O', 'F', 'P', 'S', 'Cl', 'Br'];
    const rgb = (hex: string) => [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16));
    for (let i = 0; i < common.length; i++)
      for (let j = i + 1; j < common.length; j++) {
        const [a, b] = [rgb(elementColour(common[i])), rgb(elementColour(common[j]))];
        const d = Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
        expect(d, `${common[i]} vs ${common[j]}`).toBeGreaterThanOrEqual(60);
      }
  });

  it('makes heavier members of a column darker (F → Cl → Br; below that the contrast floor holds them) and accepts any letter case', () => {
    const lum = (s: string) => contrastRatio(elementColour(s), '#000000');
    expect(lum('F')).toBeGreaterThan(lum('Cl'));
    expect(lum('Cl')).toBeGreaterThan(lum('Br'));
    expect(lum('O')).toBeGreaterThan(lum('S'));
    expect(elementColour('cl')).toBe(elementColour('Cl'));
  });
});

describe('symmetry element drawing', () => {
  it('splits an axis into dashes symmetric about the centre, inside its length', () => {
    const segs = dashSegments(2, axisPattern(3));
    expect(segs.length).toBeGreaterThan(2);
    for (const [a, b] of segs) {
      expect(a).toBeLessThan(b);
      expect(a).toBeGreaterThanOrEqual(-2);
      expect(b).toBeLessThanOrEqual(2);
      expect(segs.some(([c, d]) => close(c, -b, 1e-12) && close(d, -a, 1e-12))).toBe(true);
    }
    expect(dashSegments(2, axisPattern(2))).toEqual([[-2, 2]]);
  });

  it('gives each axis order up to 6 its own pattern', () => {
    const patterns = [2, 3, 4, 5, 6].map((n) => JSON.stringify(axisPattern(n)));
    expect(new Set(patterns).size).toBe(5);
  });
});

describe('viewer fallback without WebGL', () => {
  afterEach(cleanup);

  it('says the 3D view is unavailable and still offers the layer switches and key', () => {
    const result = resultFixture();
    render(<ViewerPanel result={result} inputAtoms={result.atoms} webgl={false} />);
    expect(screen.getByRole('note').textContent).toMatch(/3D view unavailable/);
    expect(screen.queryByTestId('structure-canvas')).toBeNull();
    expect(screen.getByRole('switch', { name: /rotation axes \(1\)/i })).toBeTruthy();
    expect(screen.getByRole('switch', { name: /mirror planes \(3\)/i })).toBeTruthy();
    expect((screen.getByRole('switch', { name: /centre of inversion/i }) as HTMLInputElement).disabled).toBe(true);
    expect(screen.getAllByRole('listitem').some((li) => /C3 axis: long dashes/.test(li.textContent ?? ''))).toBe(true);
  });

  it('detects the missing WebGL by itself in a browser without it (jsdom)', async () => {
    const result = resultFixture();
    render(<ViewerPanel result={result} inputAtoms={result.atoms} />);
    expect((await screen.findByRole('note')).textContent).toMatch(/could not start WebGL/);
  });
});
