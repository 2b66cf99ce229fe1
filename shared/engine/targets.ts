import type { SnapSettings } from '../contracts/settings';
import type { StructureResult } from '../contracts/structure';
import type { Analysis, FoundGroup } from './analysis';
import { EngineError } from './errors';
import { fitGroup, fitSubgroup, type FrameFit } from './fit-frame';
import { groupOrder, parseGroupName, subgroupsOf } from './groups';
import type { OrientedFit } from './describe';
import { axisAlignmentScore, computationalSubgroup, subgroupsNamed } from './subgroups';

/** Infinite groups count as larger than every finite one. */
export function orderRank(name: string): number {
  const o = groupOrder(name);
  return o === 0 ? Number.POSITIVE_INFINITY : o;
}

/** The fit of a found group, memoised per distinct group (`found.id`). */
export function fitFor(a: Analysis, found: FoundGroup, fits: Map<string, FrameFit>): FrameFit {
  let f = fits.get(found.id);
  if (!f) {
    f = fitGroup(a, found);
    fits.set(found.id, f);
  }
  return f;
}

/** Names of the subgroups of a perceived group (for the linear groups: via their C2v/D2h stand-ins). */
export function subgroupNames(perceived: string): string[] {
  if (perceived === 'Kh') return ['Kh'];
  const names = new Set<string>([perceived]);
  if (perceived === 'D∞h') names.add('C∞v');
  const finite = perceived === 'D∞h' ? 'D2h' : perceived === 'C∞v' ? 'C2v' : perceived;
  for (const s of subgroupsOf(finite)) names.add(s.name);
  return [...names];
}

/** Sorts group names by order, highest first (∞ first), then by name. */
export function byOrderDesc(names: Iterable<string>): string[] {
  return [...new Set(names)].sort((p, q) => orderRank(q) - orderRank(p) || p.localeCompare(q));
}

/**
 * Groups a structure may be snapped to: the groups on its ladder and the subgroups of its
 * perceived group, highest order first.
 */
export function allowedTargets(result: Pick<StructureResult, 'perceivedGroup' | 'ladder'>): string[] {
  return byOrderDesc([...result.ladder.map((r) => r.group), ...subgroupNames(result.perceivedGroup)]);
}

/** The chosen target: its fit, the found group it came from (null for a subgroup), a refused name. */
export interface Target {
  fit: FrameFit;
  found: FoundGroup | null;
  notAllowed: string | null;
}

/** Picks and fits the target group for a snap (rules in report.ts `snap`). */
export function chooseTarget(
  a: Analysis,
  perceived: FoundGroup,
  perceivedFit: OrientedFit,
  ranges: { found: FoundGroup }[],
  policy: SnapSettings['target'],
  fits: Map<string, FrameFit>,
): Target {
  const y = a.mol.y;
  if (policy.kind === 'perceived') return { fit: perceivedFit.fit, found: perceived, notAllowed: null };
  if (perceived.name === 'Kh') {
    const name = policy.kind === 'group' ? parseGroupName(policy.group) : null;
    return { fit: perceivedFit.fit, found: perceived, notAllowed: policy.kind === 'group' && name !== 'Kh' ? policy.group : null };
  }
  if (policy.kind === 'computational') {
    const sub = computationalSubgroup(perceivedFit.fit.ideal, perceivedFit.S);
    if (sub.name === perceivedFit.fit.name) return { fit: perceivedFit.fit, found: perceived, notAllowed: null };
    return { fit: fitSubgroup(y, perceivedFit.fit, sub.members, sub.name), found: null, notAllowed: null };
  }
  const name = parseGroupName(policy.group);
  if (!name) throw new EngineError('unknown-group', `target '${policy.group}' is not a point group name`);
  if (name === perceived.name) return { fit: perceivedFit.fit, found: perceived, notAllowed: null };
  const rung = ranges.find((r) => r.found.name === name);
  if (rung) return { fit: fitFor(a, rung.found, fits), found: rung.found, notAllowed: null };
  if (name === 'C∞v' && perceived.name === 'D∞h') {
    const found: FoundGroup = { name, order: 0, tolerance: perceived.tolerance, elements: [], notClosed: false, id: name };
    return { fit: fitGroup(a, found), found, notAllowed: null };
  }
  const parentName = perceivedFit.fit.ideal.name;
  const candidates = subgroupsNamed(parentName, name);
  if (candidates.length === 0) return { fit: perceivedFit.fit, found: perceived, notAllowed: name };
  let best: { fit: FrameFit; cost: number; score: number[] } | null = null;
  for (const members of candidates) {
    const fit = fitSubgroup(y, perceivedFit.fit, members, name);
    let cost = 0;
    for (let i = 0; i < fit.W.length; i++) cost += (fit.Z[i] - fit.W[i]) ** 2;
    const score = axisAlignmentScore(parentName, members, perceivedFit.S);
    const better =
      !best ||
      cost < best.cost - 1e-9 * (1 + best.cost) ||
      (Math.abs(cost - best.cost) <= 1e-9 * (1 + best.cost) && compare(score, best.score) > 0);
    if (better) best = { fit, cost, score };
  }
  return { fit: best!.fit, found: null, notAllowed: null };
}

function compare(a: number[], b: number[]): number {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i] - b[i];
  return 0;
}


