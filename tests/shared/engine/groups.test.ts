/**
 * The group catalogue: every family closes into a group of the textbook order, with the textbook
 * number of conjugacy classes and inversion centre, and its multiplication table is the matrix
 * product (a homomorphism check). Expected values: shared/reference/group-facts.md, which names
 * its sources (Atkins, Child & Phillips, *Tables for Group Theory*; Cotton, *Chemical
 * Applications of Group Theory*, 3rd ed. 1990, App. IIA) — values from memory there and
 * recomputed there by an independent closure script.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { groupOrder, isKnownGroup, parseGroupName } from '@shared/engine';
import { compareMemberLists, idealGroup, subgroupsOf } from '@shared/engine/groups';
import { identifyGroup } from '@shared/engine/identify';
import { det3, frobeniusDistance3, identity3, improper3, mul3, transpose3 } from '@shared/engine/mat3';
import { computationalSubgroup } from '@shared/engine/subgroups';

// [group, order, classes, has i, largest D2h-type subgroup(s)] — group-facts.md table.
const FACTS: [string, number, number, boolean, string][] = [
  ['C1', 1, 1, false, 'C1'], ['Cs', 2, 2, false, 'Cs'], ['Ci', 2, 2, true, 'Ci'], ['C2', 2, 2, false, 'C2'],
  ['C3', 3, 3, false, 'C1'], ['C4', 4, 4, false, 'C2'], ['C5', 5, 5, false, 'C1'], ['C6', 6, 6, false, 'C2'],
  ['C8', 8, 8, false, 'C2'], ['C2v', 4, 4, false, 'C2v'], ['C3v', 6, 3, false, 'Cs'], ['C4v', 8, 5, false, 'C2v'],
  ['C5v', 10, 4, false, 'Cs'], ['C6v', 12, 6, false, 'C2v'], ['C2h', 4, 4, true, 'C2h'], ['C3h', 6, 6, false, 'Cs'],
  ['C4h', 8, 8, true, 'C2h'], ['C5h', 10, 10, false, 'Cs'], ['C6h', 12, 12, true, 'C2h'], ['D2', 4, 4, false, 'D2'],
  ['D3', 6, 3, false, 'C2'], ['D4', 8, 5, false, 'D2'], ['D5', 10, 4, false, 'C2'], ['D6', 12, 6, false, 'D2'],
  ['D2d', 8, 5, false, 'D2|C2v'], ['D3d', 12, 6, true, 'C2h'], ['D4d', 16, 7, false, 'D2|C2v'], ['D5d', 20, 8, true, 'C2h'],
  ['D6d', 24, 9, false, 'D2|C2v'], ['D2h', 8, 8, true, 'D2h'], ['D3h', 12, 6, false, 'C2v'], ['D4h', 16, 10, true, 'D2h'],
  ['D5h', 20, 8, false, 'C2v'], ['D6h', 24, 12, true, 'D2h'], ['D8h', 32, 14, true, 'D2h'], ['S4', 4, 4, false, 'C2'],
  ['S6', 6, 6, true, 'Ci'], ['S8', 8, 8, false, 'C2'], ['T', 12, 4, false, 'D2'], ['Td', 24, 5, false, 'D2|C2v'],
  ['Th', 24, 8, true, 'D2h'], ['O', 24, 5, false, 'D2'], ['Oh', 48, 10, true, 'D2h'], ['I', 60, 5, false, 'D2'],
  ['Ih', 120, 10, true, 'D2h'],
];

describe('group catalogue (group-facts.md)', () => {
  it.each(FACTS)('%s has order %i, %i classes, inversion %s, computational subgroup %s', (name, order, classes, hasI, sub) => {
    const g = idealGroup(name);
    expect(g.elements.length).toBe(order);
    expect(groupOrder(name)).toBe(order);
    expect(new Set(g.classOf).size).toBe(classes);
    const inversion = g.elements.some((e) => frobeniusDistance3(e.matrix, [-1, 0, 0, 0, -1, 0, 0, 0, -1]) < 1e-12);
    expect(inversion).toBe(hasI);
    expect(identifyGroup(g.elements)).toBe(name);
    // In the canonical frame, which is the standard frame for these groups.
    const comp = computationalSubgroup(g, identity3());
    const [first, second] = sub.split('|');
    expect(comp.name).toBe(first);
    expect(comp.alternatives).toEqual(second ? [second] : []);
  });

  it.each(FACTS.map((f) => f[0]))('%s: matrices are orthogonal and the table is their product (closure, homomorphism)', (name) => {
    const g = idealGroup(name);
    const n = g.elements.length;
    for (const e of g.elements) {
      expect(frobeniusDistance3(mul3(e.matrix, transpose3(e.matrix)), identity3())).toBeLessThan(1e-12);
      expect(Math.abs(det3(e.matrix) - e.det)).toBeLessThan(1e-12);
    }
    for (let a = 0; a < n; a++) {
      for (let b = 0; b < n; b++) {
        const prod = mul3(g.elements[a].matrix, g.elements[b].matrix);
        expect(frobeniusDistance3(prod, g.elements[g.mul[a * n + b]].matrix)).toBeLessThan(1e-9);
      }
    }
  });
});

describe('improper rotations (from the definitions; common practice)', () => {
  const z = [0, 0, 1];
  it('S4² = C2 and S4⁴ = E', () => {
    const s4 = improper3(z, Math.PI / 2);
    expect(frobeniusDistance3(mul3(s4, s4), [-1, 0, 0, 0, -1, 0, 0, 0, 1])).toBeLessThan(1e-15);
    expect(frobeniusDistance3(mul3(mul3(s4, s4), mul3(s4, s4)), identity3())).toBeLessThan(1e-15);
  });
  const power = (m: number[], k: number) => {
    let r = identity3();
    for (let i = 0; i < k; i++) r = mul3(r, m);
    return r;
  };
  it.each([4, 6, 8, 10, 12])('S%i^n = E for even n (and no smaller power)', (n) => {
    const s = improper3(z, (2 * Math.PI) / n);
    expect(frobeniusDistance3(power(s, n), identity3())).toBeLessThan(1e-12);
    for (let k = 1; k < n; k++) expect(frobeniusDistance3(power(s, k), identity3())).toBeGreaterThan(1e-3);
  });
  it.each([3, 5, 7])('S%i^2n = E for odd n, while S^n is the reflection σh', (n) => {
    const s = improper3(z, (2 * Math.PI) / n);
    expect(frobeniusDistance3(power(s, 2 * n), identity3())).toBeLessThan(1e-12);
    expect(frobeniusDistance3(power(s, n), [1, 0, 0, 0, 1, 0, 0, 0, -1])).toBeLessThan(1e-12);
  });
});

describe('group names', () => {
  it.each([
    ['c2v', 'C2v'], ['C2V', 'C2v'], ['Dinfh', 'D∞h'], ['D*h', 'D∞h'], ['C∞v', 'C∞v'], ['Cinfv', 'C∞v'],
    ['td', 'Td'], ['IH', 'Ih'], ['s2', 'Ci'], ['C3i', 'S6'], ['S3', 'C3h'], ['c1h', 'Cs'], [' d6h ', 'D6h'],
  ])('parses %s as %s', (text, name) => {
    expect(parseGroupName(text)).toBe(name);
    expect(isKnownGroup(name)).toBe(true);
  });
  it.each(['', 'X', 'C0', 'D1', 'C2d', 'Dinfv', 'D4v', 'S', 'C99', 'Oz'])('rejects %j', (text) => {
    expect(parseGroupName(text)).toBeNull();
  });
  it('gives 0 for the infinite groups and throws a one-line EngineError for unknown names', () => {
    expect(groupOrder('C∞v')).toBe(0);
    expect(groupOrder('D∞h')).toBe(0);
    expect(() => groupOrder('Q7')).toThrow(/not a point group/);
  });
  it('lists the subgroups of D6h with their names, including the D2h-type ones', () => {
    const names = new Set(subgroupsOf('D6h').map((s) => s.name));
    for (const n of ['D6h', 'D6', 'C6v', 'D3h', 'D3d', 'C6h', 'D2h', 'C2v', 'C2h', 'D2', 'S6', 'C3', 'Cs', 'Ci', 'C1']) {
      expect(names.has(n)).toBe(true);
    }
    expect(names.has('Td')).toBe(false);
    // Lagrange: every subgroup order divides 24.
    for (const s of subgroupsOf('D6h')) expect(24 % s.members.length).toBe(0);
  });
});

describe('order of subgroup member lists', () => {
  // The engine sorts subgroups by their members' comma-joined text with a plain character
  // comparison; the order must be the one the platform's collator (ICU, through localeCompare)
  // gives that text, which the engine used before.
  it('is the collator order of the joined text', () => {
    fc.assert(
      fc.property(fc.array(fc.nat(130), { maxLength: 10 }), fc.array(fc.nat(130), { maxLength: 10 }), (a, b) => {
        expect(Math.sign(compareMemberLists(a, b))).toBe(Math.sign(a.join(',').localeCompare(b.join(','))));
      }),
      { seed: 7, numRuns: 2000 },
    );
  });
});
