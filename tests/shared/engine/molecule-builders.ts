/**
 * Builders of a handful of real molecules for the engine's unit tests. Geometries from
 * shared/reference/reference-molecules.md, with the source named there:
 *  - water: r(OH) 0.9578 Å, ∠HOH 104.4776° — NIST CCCBDB citing Hoy & Bunker, J. Mol. Spectrosc.
 *    74, 1 (1979) (verified there); point group C2v (CCCBDB); built in the yz plane;
 *  - ammonia: r(NH) 1.012 Å, ∠HNH 106.7° — CCCBDB citing Herzberg (1966); C3v (CCCBDB);
 *  - methane: r(CH) 1.0858 Å — Gray & Robiette, Mol. Phys. 37, 1901 (1979) via a study page
 *    (4th digit from memory); Td (textbook);
 *  - benzene: r(CC) 1.3914, r(CH) 1.0802 Å — Gauss & Stanton, J. Phys. Chem. A 104, 2865 (2000);
 *    D6h (CCCBDB);
 *  - CO2: r(CO) 1.1600 Å (memory); D∞h (textbook).
 */
import type { AtomJson } from '@shared/contracts/structure';

const deg = Math.PI / 180;

export function water(): AtomJson[] {
  const r = 0.9578;
  const half = (104.4776 * deg) / 2;
  return [
    { element: 'O', x: 0, y: 0, z: 0 },
    { element: 'H', x: 0, y: r * Math.sin(half), z: r * Math.cos(half) },
    { element: 'H', x: 0, y: -r * Math.sin(half), z: r * Math.cos(half) },
  ];
}

export function ammonia(): AtomJson[] {
  const r = 1.012;
  const hnh = 106.7 * deg;
  // angle β between the C3 axis and an N–H bond: cos ∠HNH = 1 − 1.5 sin²β
  const sinb = Math.sqrt((2 / 3) * (1 - Math.cos(hnh)));
  const cosb = Math.sqrt(1 - sinb * sinb);
  const atoms: AtomJson[] = [{ element: 'N', x: 0, y: 0, z: 0 }];
  for (let k = 0; k < 3; k++) {
    const p = (2 * Math.PI * k) / 3;
    atoms.push({ element: 'H', x: r * sinb * Math.cos(p), y: r * sinb * Math.sin(p), z: -r * cosb });
  }
  return atoms;
}

export function methane(): AtomJson[] {
  const c = 1.0858 / Math.sqrt(3);
  return [
    { element: 'C', x: 0, y: 0, z: 0 },
    { element: 'H', x: c, y: c, z: c },
    { element: 'H', x: -c, y: -c, z: c },
    { element: 'H', x: -c, y: c, z: -c },
    { element: 'H', x: c, y: -c, z: -c },
  ];
}

export function benzene(): AtomJson[] {
  const atoms: AtomJson[] = [];
  for (let k = 0; k < 6; k++) {
    const a = (k * Math.PI) / 3;
    atoms.push({ element: 'C', x: 1.3914 * Math.cos(a), y: 1.3914 * Math.sin(a), z: 0 });
    atoms.push({ element: 'H', x: (1.3914 + 1.0802) * Math.cos(a), y: (1.3914 + 1.0802) * Math.sin(a), z: 0 });
  }
  return atoms;
}

export function co2(): AtomJson[] {
  return [
    { element: 'O', x: 0, y: 0, z: -1.16 },
    { element: 'C', x: 0, y: 0, z: 0 },
    { element: 'O', x: 0, y: 0, z: 1.16 },
  ];
}

