import { useState, type ReactNode } from 'react';
import type { AtomJson, StructureResult } from '@shared/contracts/structure';
import { Button } from '@/components/ui/button';
import { cx } from '@/lib/cx';
import { formatAngstrom } from '@/lib/format';

const coord = (v: number) => v.toFixed(6);
const axisText = (a: readonly number[]) => `(${a.map((v) => (Math.abs(v) < 5e-5 ? 0 : v).toFixed(3)).join(', ')})`;
const ROWS_COLLAPSED = 40;

function Card({ title, id, children, note }: { title: string; id: string; children: ReactNode; note?: ReactNode }) {
  return (
    <section aria-labelledby={id} className="flex min-w-0 flex-col gap-2 rounded-lg border border-rule bg-card p-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id={id} className="text-sm font-semibold text-ink">
          {title}
        </h2>
        {note && <span className="text-xs text-ink-faint">{note}</span>}
      </div>
      {children}
    </section>
  );
}

/** Every symmetry operation found, with its axis and its residual on the input geometry. */
export function OperationsTable({ result }: { result: StructureResult }) {
  const worst = Math.max(0, ...result.operations.map((o) => o.residual));
  return (
    <Card title={`Operations (${result.operations.length})`} id="ops-h" note={`largest residual ${formatAngstrom(worst)} · tolerance ${formatAngstrom(result.tolerance)}`}>
      <div className="max-h-96 overflow-auto">
        <table className="w-full border-collapse text-sm">
          <caption className="sr-only">Symmetry operations with axis (unit vector, output frame) and residual on the input geometry</caption>
          <thead className="sticky top-0 border-b border-rule bg-card text-left text-xs font-semibold text-ink-soft">
            <tr>
              <th scope="col" className="px-2 py-1.5">Operation</th>
              <th scope="col" className="px-2 py-1.5">Kind</th>
              <th scope="col" className="px-2 py-1.5">Axis / normal</th>
              <th scope="col" className="px-2 py-1.5 text-right">Residual</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-rule/60">
            {result.operations.map((op, i) => (
              <tr key={i}>
                <th scope="row" className="num px-2 py-1 text-left font-semibold">{op.symbol}</th>
                <td className="px-2 py-1 text-ink-soft">{op.kind}</td>
                <td className="num px-2 py-1 text-xs whitespace-nowrap">{op.kind === 'identity' || op.kind === 'inversion' ? '—' : axisText(op.axis)}</td>
                <td className="num px-2 py-1 text-right whitespace-nowrap">{formatAngstrom(op.residual)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </Card>
  );
}

/** Classes of symmetry-equivalent atoms; the symmetry-unique representative of each is marked. */
export function EquivalenceClasses({ result }: { result: StructureResult }) {
  const unique = new Set(result.uniqueAtoms);
  return (
    <Card title={`Equivalence classes (${result.equivalenceClasses.length})`} id="classes-h" note={`${result.uniqueAtoms.length} symmetry-unique atoms · atoms numbered from 1`}>
      <ol className="flex max-h-96 flex-col gap-1 overflow-auto text-sm">
        {result.equivalenceClasses.map((cls, k) => (
          <li key={k} className="flex flex-wrap items-baseline gap-x-2">
            <span className="num w-14 shrink-0 text-ink-faint">#{k + 1}</span>
            <span className="font-medium">{result.atoms[cls[0]]?.element ?? '?'}</span>
            <span className="num text-xs text-ink-faint">×{cls.length}</span>
            <span className="num flex flex-wrap gap-1 text-xs">
              {cls.map((i) => (
                <span key={i} className={cx('rounded px-1', unique.has(i) ? 'bg-saffron-wash font-semibold text-ink' : 'text-ink-soft')} title={unique.has(i) ? 'symmetry-unique atom' : undefined}>
                  {i + 1}
                  {unique.has(i) && <span className="sr-only"> (unique)</span>}
                </span>
              ))}
            </span>
          </li>
        ))}
      </ol>
    </Card>
  );
}

/** Per-atom table: output coordinates (Å, output frame) and how far each atom moved. */
export function AtomTable({ result, budget }: { result: StructureResult; budget: number }) {
  const [expanded, setExpanded] = useState(false);
  const atoms: AtomJson[] = result.atoms;
  const shown = expanded ? atoms : atoms.slice(0, ROWS_COLLAPSED);
  return (
    <Card title={`Atoms (${atoms.length})`} id="atoms-h" note={`frame: ${result.frame === 'standard' ? 'standard orientation' : 'input frame'} · displacement after optimal superposition`}>
      <div className="overflow-auto">
        <table className="w-full border-collapse text-sm">
          <caption className="sr-only">Atoms with output coordinates and displacement, in Å</caption>
          <thead className="border-b border-rule text-left text-xs font-semibold text-ink-soft">
            <tr>
              <th scope="col" className="px-2 py-1.5">#</th>
              <th scope="col" className="px-2 py-1.5">Element</th>
              <th scope="col" className="px-2 py-1.5 text-right">x</th>
              <th scope="col" className="px-2 py-1.5 text-right">y</th>
              <th scope="col" className="px-2 py-1.5 text-right">z</th>
              <th scope="col" className="px-2 py-1.5 text-right">Displacement</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-rule/60">
            {shown.map((a, i) => {
              const d = result.displacements[i];
              const over = d !== undefined && d > budget;
              return (
                <tr key={i} className={cx(over && 'bg-ochre-wash')}>
                  <th scope="row" className="num px-2 py-1 text-left font-normal text-ink-faint">{i + 1}</th>
                  <td className="px-2 py-1 font-medium">{a.element}</td>
                  <td className="num px-2 py-1 text-right">{coord(a.x)}</td>
                  <td className="num px-2 py-1 text-right">{coord(a.y)}</td>
                  <td className="num px-2 py-1 text-right">{coord(a.z)}</td>
                  <td className={cx('num px-2 py-1 text-right whitespace-nowrap', over && 'font-semibold text-ochre')}>
                    {formatAngstrom(d ?? null)}
                    {over && <span className="sr-only"> (over the budget)</span>}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {atoms.length > ROWS_COLLAPSED && (
        <Button variant="quiet" size="sm" className="self-start" onClick={() => setExpanded((e) => !e)}>
          {expanded ? 'Show fewer atoms' : `Show all ${atoms.length} atoms`}
        </Button>
      )}
    </Card>
  );
}
