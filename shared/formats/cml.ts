import type { AtomJson } from '../contracts/structure';
import {
  DEFAULT_MAX_ATOMS,
  FrameError,
  atomFrom,
  chargeFrom,
  cleanName,
  defaultName,
  failure,
  multiplicityFrom,
  tooManyAtoms,
  splitFields,
  type ReadOptions,
} from './common';
import type { ReadResult } from './types';
import { XmlSyntaxError, localName, xmlTokens } from './xml-tokens';

/**
 * Chemical Markup Language (CML, schema 2.4 / 3 conventions): every `<molecule>` that directly
 * holds an `<atomArray>` is one structure, in document order (wrapper molecules without atoms are
 * skipped). Atoms as `<atom elementType="C" x3="…" y3="…" z3="…"/>` (Å) or in the array form
 * `<atomArray elementType="C H H" x3="…" y3="…" z3="…"/>`. Atoms with only 2D coordinates are
 * refused. Charge: the molecule's `formalCharge` attribute, else the sum of the atoms'
 * `formalCharge` attributes where any is present, else null. Multiplicity: the molecule's
 * `spinMultiplicity`. Name: `title`, else a `<name>` child, else `id`. Namespace prefixes are
 * ignored. A syntax error ends the file there: molecules closed before it are kept.
 */

interface MoleculeContext {
  line: number;
  attrs: Record<string, string>;
  atoms: AtomJson[];
  atomCount: number;
  atomCharge: number | null;
  hasAtomArray: boolean;
  name: string | null;
  error: FrameError | null;
  /** Depth (in the element stack) of this molecule. */
  depth: number;
}

/** Read every molecule of a CML document. Never throws. */
export function readCml(file: string, text: string, options: ReadOptions = {}): ReadResult[] {
  const maxAtoms = options.maxAtoms ?? DEFAULT_MAX_ATOMS;
  const out: ReadResult[] = [];
  const stack: string[] = [];
  const molecules: MoleculeContext[] = [];
  let frame = 0;
  let inName = false;
  let sawMolecule = false;

  const addAtom = (m: MoleculeContext, el: string | undefined, x: string | undefined, y: string | undefined, z: string | undefined, fc: string | undefined, line: number, label: string) => {
    m.atomCount++;
    if (m.error) return;
    if (m.atomCount > maxAtoms) {
      m.error = new FrameError(m.line, '');
      m.atoms = [];
      return;
    }
    if (el == null) throw new FrameError(line, `atom ${m.atomCount}${label}: no elementType`);
    if (x == null || y == null || z == null) throw new FrameError(line, `atom ${m.atomCount}${label}: no 3D coordinates (x3, y3, z3)`);
    m.atoms.push(atomFrom(el, x, y, z, m.atomCount, line));
    if (fc != null) m.atomCharge = (m.atomCharge ?? 0) + chargeFrom(fc, line);
  };

  const finish = (m: MoleculeContext) => {
    if (!m.hasAtomArray) return;
    if (m.atomCount > maxAtoms) out.push(failure(file, frame, m.line, tooManyAtoms(m.atomCount, maxAtoms)));
    else if (m.error) out.push(failure(file, frame, m.error.line, m.error.message));
    else if (m.atoms.length === 0) out.push(failure(file, frame, m.line, 'the molecule has no atoms'));
    else {
      try {
        const a = m.attrs;
        const charge = a.formalCharge != null ? chargeFrom(a.formalCharge, m.line) : m.atomCharge;
        const multiplicity = a.spinMultiplicity != null ? multiplicityFrom(a.spinMultiplicity, m.line) : null;
        out.push({
          ok: true,
          molecule: {
            name: cleanName(a.title) ?? m.name ?? cleanName(a.id) ?? defaultName(file, frame),
            sourceFile: file,
            frameIndex: frame,
            atoms: m.atoms,
            charge,
            multiplicity,
          },
        });
      } catch (e) {
        if (!(e instanceof FrameError)) throw e;
        out.push(failure(file, frame, e.line, e.message));
      }
    }
    frame++;
  };

  try {
    for (const tok of xmlTokens(text)) {
      const m = molecules[molecules.length - 1];
      if (tok.kind === 'open') {
        const name = localName(tok.name);
        if (name === 'molecule') {
          sawMolecule = true;
          molecules.push({
            line: tok.line, attrs: tok.attrs, atoms: [], atomCount: 0, atomCharge: null,
            hasAtomArray: false, name: null, error: null, depth: stack.length,
          });
          if (tok.selfClosing) finish(molecules.pop()!);
          else stack.push(name);
          continue;
        }
        if (m) {
          try {
            if (name === 'atomArray' && stack.length === m.depth + 1) {
              m.hasAtomArray = true;
              const a = tok.attrs;
              if (a.elementType != null) {
                // Array form: parallel white-space separated lists.
                const split = (v: string | undefined) => (v == null ? undefined : splitFields(v));
                const els = split(a.elementType)!;
                const [xs, ys, zs, fcs, ids] = [split(a.x3), split(a.y3), split(a.z3), split(a.formalCharge), split(a.atomID)];
                for (const list of [xs, ys, zs, fcs]) {
                  if (list && list.length !== els.length) {
                    throw new FrameError(tok.line, `atomArray lists ${els.length} elementTypes but ${list.length} values in another attribute`);
                  }
                }
                for (let i = 0; i < els.length; i++) {
                  addAtom(m, els[i], xs?.[i], ys?.[i], zs?.[i], fcs?.[i], tok.line, ids ? ` (${ids[i]})` : '');
                }
              }
            } else if (name === 'atom' && stack[stack.length - 1] === 'atomArray' && stack.length === m.depth + 2) {
              const a = tok.attrs;
              addAtom(m, a.elementType, a.x3, a.y3, a.z3, a.formalCharge, tok.line, a.id ? ` (${a.id})` : '');
            } else if (name === 'name' && stack.length === m.depth + 1 && m.name == null) {
              inName = !tok.selfClosing;
            }
          } catch (e) {
            if (!(e instanceof FrameError)) throw e;
            m.error ??= e;
          }
        }
        if (!tok.selfClosing) stack.push(name);
      } else if (tok.kind === 'close') {
        const name = localName(tok.name);
        const top = stack.pop();
        if (top !== name) {
          throw new XmlSyntaxError(tok.line, top == null ? `unexpected end tag </${tok.name}>` : `end tag </${tok.name}> does not match <${top}>`);
        }
        if (name === 'name') inName = false;
        if (name === 'molecule') finish(molecules.pop()!);
      } else if (inName && m) {
        m.name = cleanName(tok.text);
        inName = false;
      }
    }
    if (stack.length > 0) throw new XmlSyntaxError(text.split('\n').length, `the document ends inside <${stack[stack.length - 1]}>`);
  } catch (e) {
    if (!(e instanceof XmlSyntaxError)) throw e;
    out.push(failure(file, frame, e.line, `XML syntax error: ${e.message}`));
    return out;
  }
  if (out.length === 0) {
    out.push(failure(file, 0, null, sawMolecule ? 'no <molecule> with an <atomArray> found' : 'no <molecule> element found'));
  }
  return out;
}
