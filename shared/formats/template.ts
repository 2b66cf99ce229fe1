import type { StructureResult } from '../contracts/structure';
import { BOHR_IN_ANGSTROM } from './qcschema';
import { fixed } from './xyz';

/**
 * Export templates: a workspace's own input deck with Pointfold placeholders, rendered once per
 * snapped structure. A placeholder is a name in double braces, spaces allowed inside the braces
 * (`{{charge}}`, `{{ geometry }}`). Text outside placeholders is copied unchanged, so any program's
 * deck syntax can be written around them.
 *
 * ```
 * ! job for {{name}} ({{formula}}), snapped to {{group}}
 * symmetry {{subgroup}}
 * charge {{charge}} multiplicity {{multiplicity}}
 * geometry angstrom
 * {{geometry}}
 * end
 * ```
 */

/** Decimals of every coordinate a template writes (the same as the XYZ writer's floor). */
export const TEMPLATE_DECIMALS = 10;

/** Placeholder names with what each expands to, in the order the owner's form lists them. */
export const TEMPLATE_PLACEHOLDERS = {
  name: 'structure name',
  formula: 'formula in Hill order, e.g. H2O',
  charge: 'total charge (integer)',
  multiplicity: 'spin multiplicity 2S+1',
  group: 'point group the structure was snapped to (Schoenflies, e.g. C2v)',
  subgroup: 'computational subgroup (largest D2h-type subgroup, e.g. C2v)',
  perceivedGroup: 'point group perceived on the input at the tolerance',
  natoms: 'number of atoms',
  nunique: 'number of symmetry-unique atoms',
  geometry: 'one line per atom: element x y z (Å, 10 decimals)',
  geometryBohr: 'as geometry, in bohr (CODATA 2018 Bohr radius 0.529177210903 Å)',
  uniqueGeometry: 'as geometry, symmetry-unique atoms only (Å)',
} as const satisfies Record<string, string>;

/** A placeholder name that {@link renderTemplate} fills. */
export type TemplatePlaceholder = keyof typeof TEMPLATE_PLACEHOLDERS;

/** Options of {@link renderTemplate}. */
export interface RenderTemplateOptions {
  /** The name `{{name}}` expands to (default: the result's own name). */
  name?: string;
}

const PLACEHOLDER = /\{\{\s*([^{}]*?)\s*\}\}/g;

function isPlaceholder(name: string): name is TemplatePlaceholder {
  return Object.prototype.hasOwnProperty.call(TEMPLATE_PLACEHOLDERS, name);
}

/**
 * Placeholders in `body` that Pointfold does not know, each once, in order of first use (what the
 * owner's form reports as an error). A `{{` with no closing `}}` is reported as `{{…` with the text
 * that follows it, so a typo such as `{{charge}` does not pass silently.
 */
export function validateTemplate(body: string): string[] {
  const unknown: string[] = [];
  const add = (name: string) => {
    if (!unknown.includes(name)) unknown.push(name);
  };
  for (const m of body.matchAll(PLACEHOLDER)) if (!isPlaceholder(m[1])) add(m[1]);
  const rest = body.replace(PLACEHOLDER, '');
  const open = rest.indexOf('{{');
  if (open >= 0) add(rest.slice(open, open + 20).split('\n')[0]);
  return unknown;
}

/**
 * The problems {@link validateTemplate} found, as one line for a form or an API error:
 * `unknown placeholder {{chrage}}, {{Group}}` / `… {{charge} (not closed)`.
 */
export function describeTemplateProblems(unknown: readonly string[]): string {
  const items = unknown.map((u) => (u.startsWith('{{') ? `${u} (not closed)` : `{{${u}}}`));
  return `unknown placeholder${items.length > 1 ? 's' : ''} ${items.join(', ')}`;
}

/** One line per atom: `El  x  y  z`, coordinates × `scale` with {@link TEMPLATE_DECIMALS} decimals. */
function geometryLines(atoms: StructureResult['atoms'], scale: number): string {
  return atoms
    .map((a) => [a.element.padEnd(2), ...[a.x, a.y, a.z].map((v) => fixed(v * scale, TEMPLATE_DECIMALS).padStart(18))].join(' '))
    .join('\n');
}

/**
 * Renders a template for one snapped structure. Coordinates are the snapped output atoms in the
 * input's atom order, in the frame the batch asked for (standard or input); `geometryBohr`
 * divides Å by the CODATA 2018 Bohr radius ({@link BOHR_IN_ANGSTROM}). Unknown placeholders are
 * left as written (check with {@link validateTemplate} before saving a template). Pure; never throws.
 *
 * @param body the template text
 * @param result a snap result (`snap()` or a stored structure's result)
 */
export function renderTemplate(body: string, result: StructureResult, options: RenderTemplateOptions = {}): string {
  const values: Record<TemplatePlaceholder, () => string> = {
    name: () => options.name ?? result.name,
    formula: () => result.formula,
    charge: () => String(result.charge),
    multiplicity: () => String(result.multiplicity),
    group: () => result.pointGroup,
    subgroup: () => result.computationalSubgroup,
    perceivedGroup: () => result.perceivedGroup,
    natoms: () => String(result.atoms.length),
    nunique: () => String(result.uniqueAtoms.length),
    geometry: () => geometryLines(result.atoms, 1),
    geometryBohr: () => geometryLines(result.atoms, 1 / BOHR_IN_ANGSTROM),
    uniqueGeometry: () => geometryLines(result.uniqueAtoms.map((i) => result.atoms[i]), 1),
  };
  return body.replace(PLACEHOLDER, (text, name: string) => (isPlaceholder(name) ? values[name]() : text));
}
