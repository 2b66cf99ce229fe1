/**
 * The engine's own small numerics against a general-purpose registry library (ml-matrix 6.15.1:
 * EigenvalueDecomposition, SingularValueDecomposition) and against textbook identities.
 */
import fc from 'fast-check';
import { determinant, EigenvalueDecomposition, Matrix, SingularValueDecomposition } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { correlation, orthogonalFromCorrelation, rotationFromCorrelation } from '@shared/engine/kabsch';
import { axisAngle3, det3, frobeniusDistance3, improper3, mul3, mul33, reflection3, rotation3, transpose3 } from '@shared/engine/mat3';
import { PairSet } from '@shared/engine/candidates';
import { regularize } from '@shared/engine/operations';
import { projectOntoGroup } from '@shared/engine/project';
import { idealGroup } from '@shared/engine/groups';
import { symmetricEigen, topEigenvector } from '@shared/engine/symmetric-eigen';

const RUNS = { seed: 4242, numRuns: 60 };
const num = fc.double({ min: -5, max: 5, noNaN: true });

describe('symmetricEigen (cyclic Jacobi) agrees with ml-matrix', () => {
  it('on random symmetric 3×3 and 4×4 matrices', () => {
    fc.assert(
      fc.property(fc.integer({ min: 3, max: 4 }), fc.array(num, { minLength: 16, maxLength: 16 }), (n, v) => {
        const a = Array.from({ length: n * n }, (_, k) => {
          const i = Math.floor(k / n);
          const j = k % n;
          return i <= j ? v[i * n + j] : v[j * n + i];
        });
        const ours = symmetricEigen(a, n);
        const theirs = new EigenvalueDecomposition(new Matrix(Array.from({ length: n }, (_, i) => a.slice(i * n, i * n + n))), {
          assumeSymmetric: true,
        });
        const ref = [...theirs.realEigenvalues].sort((p, q) => p - q);
        ours.values.forEach((x, k) => expect(x).toBeCloseTo(ref[k], 9));
        // A·v = λ·v for each of ours
        ours.vectors.forEach((vec, k) => {
          for (let i = 0; i < n; i++) {
            let s = 0;
            for (let j = 0; j < n; j++) s += a[i * n + j] * vec[j];
            expect(s).toBeCloseTo(ours.values[k] * vec[i], 8);
          }
        });
      }),
      RUNS,
    );
  });
});

describe('topEigenvector on 4×4 matrices (characteristic polynomial, Jacobi fallback) agrees with ml-matrix', () => {
  // Spectra chosen to reach both paths: well separated, nearly degenerate and exactly degenerate
  // top eigenvalues (the latter two fall back to Jacobi). Any unit vector of the top eigenspace is
  // a correct answer, so the check is its Rayleigh quotient against ml-matrix's largest eigenvalue.
  it.each([
    ['separated', [3, 1.2, -1.5, -2.7]],
    ['close pair (gap 1e-4)', [3, 3 - 1e-4, -2.5, -3.5]],
    ['close pair (gap 1e-9)', [3, 3 - 1e-9, -2.5, -3.5]],
    ['degenerate pair', [2, 2, -1, -3]],
    ['shifted, not trace-free', [103, 101, 100.5, 99]],
    ['tiny scale', [3e-12, 1e-12, -1e-12, -2e-12]],
  ])('%s', (_, spectrum) => {
    fc.assert(
      fc.property(fc.array(num, { minLength: 16, maxLength: 16 }), (raw) => {
        // A random orthogonal basis from the QR (Gram–Schmidt) of a random matrix.
        const basis: number[][] = [];
        for (let k = 0; k < 4 && basis.length < 4; k++) {
          let v = raw.slice(4 * k, 4 * k + 4).map((x, i) => x + (i === k ? 7 : 0));
          for (const u of basis) {
            const d = v.reduce((s, x, i) => s + x * u[i], 0);
            v = v.map((x, i) => x - d * u[i]);
          }
          const nv = Math.hypot(...v);
          basis.push(v.map((x) => x / nv));
        }
        const a = Array.from({ length: 16 }, (_, k) => {
          const i = Math.floor(k / 4);
          const j = k % 4;
          return basis.reduce((s, u, m) => s + u[i] * spectrum[m] * u[j], 0);
        });
        const q = [0, 0, 0, 0];
        topEigenvector(a, 4, q);
        expect(Math.hypot(...q)).toBeCloseTo(1, 12);
        const top = Math.max(
          ...new EigenvalueDecomposition(new Matrix([0, 1, 2, 3].map((i) => a.slice(4 * i, 4 * i + 4))), { assumeSymmetric: true })
            .realEigenvalues,
        );
        let rayleigh = 0;
        for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) rayleigh += q[i] * a[4 * i + j] * q[j];
        const scale = Math.max(...spectrum.map(Math.abs));
        expect(Math.abs(rayleigh - top)).toBeLessThan(1e-12 * scale);
      }),
      RUNS,
    );
  });
});

describe('Horn quaternion rotation equals the Kabsch SVD rotation (Kabsch 1976/1978, via ml-matrix SVD)', () => {
  it('on random point sets', () => {
    fc.assert(
      fc.property(fc.array(num, { minLength: 15, maxLength: 15 }), fc.array(num, { minLength: 15, maxLength: 15 }), (p, q) => {
        const s = correlation(p, q);
        const ours = rotationFromCorrelation(s);
        const H = new Matrix([s.slice(0, 3), s.slice(3, 6), s.slice(6, 9)]);
        const svd = new SingularValueDecomposition(H);
        const U = svd.leftSingularVectors;
        const V = svd.rightSingularVectors;
        const d = Math.sign(determinant(V.mmul(U.transpose()))) || 1;
        const D = Matrix.diag([1, 1, d]);
        const R = V.mmul(D).mmul(U.transpose()).to1DArray();
        // Degenerate cases (two equal singular values) have several optima; compare the score.
        const score = (r: number[]) => r.reduce((acc, v, i) => acc + v * s[3 * (i % 3) + Math.floor(i / 3)], 0);
        expect(score(ours)).toBeCloseTo(score(R), 8);
        expect(det3(ours)).toBeCloseTo(1, 12);
      }),
      RUNS,
    );
  });
  it('recovers a known rotation exactly, and the best improper matrix for a mirrored copy', () => {
    const R = rotation3([0.6, 0, 0.8], 1.1);
    const p = [1, 0.2, -0.3, -0.5, 1.2, 0.4, 0.3, -0.9, 1.5, 2, 1, 0];
    const q: number[] = [];
    const m: number[] = [];
    const sigma = reflection3([0, 1, 0]);
    for (let i = 0; i < 4; i++) {
      const v = p.slice(3 * i, 3 * i + 3);
      q.push(...[0, 1, 2].map((r) => R[3 * r] * v[0] + R[3 * r + 1] * v[1] + R[3 * r + 2] * v[2]));
      m.push(...[0, 1, 2].map((r) => sigma[3 * r] * v[0] + sigma[3 * r + 1] * v[1] + sigma[3 * r + 2] * v[2]));
    }
    expect(frobeniusDistance3(rotationFromCorrelation(correlation(p, q)), R)).toBeLessThan(1e-12);
    expect(frobeniusDistance3(orthogonalFromCorrelation(correlation(p, m), -1), sigma)).toBeLessThan(1e-12);
  });
});

describe('regularize snaps a nearly exact element onto the exact one of the given order', () => {
  it.each([
    ['C5', rotation3([0, 0.6, 0.8], (2 * Math.PI) / 5), 1, 5],
    ['C3^2', rotation3([1, 0, 0], (4 * Math.PI) / 3), 1, 3],
    ['C2', rotation3([0, 1, 0], Math.PI), 1, 2],
    ['σ', reflection3([0.6, 0.8, 0]), -1, 2],
    ['S4', improper3([0, 0, 1], Math.PI / 2), -1, 4],
    ['S3', improper3([0, 0, 1], (2 * Math.PI) / 3), -1, 6],
    ['i', [-1, 0, 0, 0, -1, 0, 0, 0, -1], -1, 2],
  ] as const)('%s', (_, exact, det, order) => {
    const wobble = rotation3([0.3, 0.4, 0.866], 2e-3);
    const noisy = mul3(wobble, exact as number[]);
    const r = regularize(noisy, det as 1 | -1, order)!;
    expect(r).not.toBeNull();
    expect(frobeniusDistance3(r.matrix, exact as number[])).toBeLessThan(5e-3);
    // exactly of that order: M^order = E
    let p = r.matrix;
    for (let k = 1; k < order; k++) p = mul3(p, r.matrix);
    expect(frobeniusDistance3(p, [1, 0, 0, 0, 1, 0, 0, 0, 1])).toBeLessThan(1e-12);
  });
  it('refuses an order the matrix cannot have', () => {
    expect(regularize(rotation3([0, 0, 1], Math.PI), 1, 3)).toBeNull();
    expect(regularize(reflection3([0, 0, 1]), -1, 3)).toBeNull();
  });
  it('axisAngle3 inverts Rodrigues near 0, π/2 and π', () => {
    for (const angle of [1e-3, Math.PI / 2, Math.PI - 1e-7, Math.PI]) {
      const axis = [0.48, 0.6, 0.64];
      const back = axisAngle3(rotation3(axis, angle));
      expect(back.angle).toBeCloseTo(angle, 9);
      expect(frobeniusDistance3(rotation3(back.axis, back.angle), rotation3(axis, angle))).toBeLessThan(1e-9);
    }
  });
});

describe('group average (methods.md (a))', () => {
  it('is idempotent and keeps the centroid at the origin, for every element permutation of a synthetic D3h orbit', () => {
    const g = idealGroup('D3h');
    // 12 points: orbit of one generic point; the permutation of element k sends point j to k∘j.
    const seed = [1.1, 0.3, 0.7];
    const pts = g.elements.map((e) => [0, 1, 2].map((r) => e.matrix[3 * r] * seed[0] + e.matrix[3 * r + 1] * seed[1] + e.matrix[3 * r + 2] * seed[2]));
    const n = pts.length;
    const perms = g.elements.map((_, k) => Int32Array.from({ length: n }, (_, j) => g.mul[k * n + j]));
    const rand = (i: number) => Math.sin(12.9898 * i) * 0.01;
    const z = new Float64Array(pts.flat().map((v, i) => v + rand(i)));
    // centred coordinates (methods.md (a) works about the fixed point)
    for (let d = 0; d < 3; d++) {
      let c = 0;
      for (let i = 0; i < n; i++) c += z[3 * i + d] / n;
      for (let i = 0; i < n; i++) z[3 * i + d] -= c;
    }
    const mats = g.elements.map((e) => e.matrix);
    const once = projectOntoGroup(z, mats, perms);
    const twice = projectOntoGroup(once, mats, perms);
    for (let i = 0; i < z.length; i++) expect(Math.abs(twice[i] - once[i])).toBeLessThan(1e-14);
    for (let d = 0; d < 3; d++) {
      let a = 0;
      let b = 0;
      for (let i = 0; i < n; i++) {
        a += z[3 * i + d];
        b += once[3 * i + d];
      }
      expect(Math.abs(a - b)).toBeLessThan(1e-12);
    }
    // the result is exactly invariant: D(g)·x̄_i = x̄_π(i)
    g.elements.forEach((e, k) => {
      for (let i = 0; i < n; i++) {
        const j = perms[k][i];
        for (let r = 0; r < 3; r++) {
          const v = e.matrix[3 * r] * once[3 * i] + e.matrix[3 * r + 1] * once[3 * i + 1] + e.matrix[3 * r + 2] * once[3 * i + 2];
          expect(Math.abs(v - once[3 * j + r])).toBeLessThan(1e-13);
        }
      }
    });
    expect(transpose3(mats[0])).toEqual(mats[0]);
  });
});

describe('mul33, the triple product of 3×3 matrices', () => {
  const mat = fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 9, maxLength: 9 });
  it('is bit for bit mul3(mul3(a, b), c), and (a·b)·c by ml-matrix to rounding', () => {
    fc.assert(
      fc.property(mat, mat, mat, (a, b, c) => {
        expect(mul33(a, b, c)).toEqual(mul3(mul3(a, b), c));
        const m = (v: number[]) => new Matrix([v.slice(0, 3), v.slice(3, 6), v.slice(6, 9)]);
        const ref = m(a).mmul(m(b)).mmul(m(c)).to1DArray();
        const got = mul33(a, b, c);
        for (let i = 0; i < 9; i++) expect(got[i]).toBeCloseTo(ref[i], 8);
      }),
      { seed: 3, numRuns: 300 },
    );
  });
});

describe('PairSet, the table of tried directions', () => {
  // Reference: a JavaScript Set of the pairs' text (common practice; the table must answer alike).
  it('says whether a pair is new, like a Set, across growth and clearing', () => {
    // Small values repeat often; large ones are the real range (tag·4001 + q₀ ≤ 532,131, q₁·4001 + q₂ ≤ 16,008,000).
    const part = (max: number) => fc.oneof(fc.integer({ min: 0, max: 12 }), fc.integer({ min: 0, max }));
    fc.assert(
      fc.property(fc.array(fc.array(fc.tuple(part(600_000), part(17_000_000)), { maxLength: 400 }), { maxLength: 4 }), (rounds) => {
        const table = new PairSet();
        for (const pairs of rounds) {
          table.clear();
          const seen = new Set<string>();
          for (const [a, b] of pairs) {
            const isNew = !seen.has(`${a},${b}`);
            seen.add(`${a},${b}`);
            expect(table.add(a, b)).toBe(isNew);
          }
        }
      }),
      { seed: 11, numRuns: 150 },
    );
  });
});
