import type { ReactNode } from 'react';
import { Bar, BarChart, CartesianGrid, Cell, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { Spinner } from '@/components/ui/spinner';
import { InlineError } from '@/components/ui/states';
import { formatAngstrom, formatCount } from '@/lib/format';
import type { BatchDetail } from '../api/get-batch';
import { useDisplacementHistogram } from '../api/get-displacement-histogram';
import { displacementHistogram } from './histogram';

// Palette values (src/styles/index.css); recharts draws SVG attributes, not classes.
const LAPIS = '#2b4c9b';
const OCHRE = '#8a5a00';
const SAFFRON = '#d98e1f';
const INK_SOFT = '#4a5264';
const RULE = '#d8d2c4';
const tick = { fill: INK_SOFT, fontSize: 11, fontFamily: 'JetBrains Mono, monospace' };

/**
 * The batch's two charts: how many structures have each perceived group, and a histogram of
 * the largest displacement per structure with the bin holding the displacement budget marked.
 * Loaded lazily (recharts is large); each chart has a text alternative.
 */
export function BatchCharts({ slug, batch }: { slug: string; batch: BatchDetail }) {
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      <GroupsChart batch={batch} />
      <DisplacementChart slug={slug} batch={batch} />
    </div>
  );
}

function ChartCard({ title, note, children }: { title: string; note?: string; children: ReactNode }) {
  return (
    <figure className="flex flex-col gap-2 rounded-lg border border-rule bg-card p-4">
      <figcaption className="flex flex-wrap items-baseline justify-between gap-2">
        <span className="text-sm font-semibold text-ink">{title}</span>
        {note && <span className="text-xs text-ink-faint">{note}</span>}
      </figcaption>
      {children}
    </figure>
  );
}

function GroupsChart({ batch }: { batch: BatchDetail }) {
  const data = batch.groups;
  return (
    <ChartCard title="Perceived groups" note={`${formatCount(batch.counts.done)} structures finished`}>
      {data.length === 0 ? (
        <p className="py-10 text-center text-sm text-ink-soft">No structure has finished yet.</p>
      ) : (
        <>
          <div className="h-52" aria-hidden>
            <ResponsiveContainer width="100%" height="100%" initialDimension={{ width: 520, height: 208 }}>
              <BarChart data={data} margin={{ top: 8, right: 8, bottom: 4, left: 0 }}>
                <CartesianGrid vertical={false} stroke={RULE} />
                <XAxis dataKey="group" tick={{ ...tick, fontSize: data.length > 12 ? 10 : 11 }} interval={0} angle={data.length > 8 ? -40 : 0} textAnchor={data.length > 8 ? 'end' : 'middle'} height={data.length > 8 ? 40 : 24} />
                <YAxis allowDecimals={false} tick={tick} width={40} />
                <Tooltip formatter={(v) => [formatCount(Number(v)), 'structures']} />
                <Bar dataKey="count" fill={LAPIS} radius={[3, 3, 0, 0]} isAnimationActive={false} />
              </BarChart>
            </ResponsiveContainer>
          </div>
          <table className="sr-only">
            <caption>Structures per perceived group</caption>
            <tbody>
              {data.map((g) => (
                <tr key={g.group}>
                  <th scope="row">{g.group}</th>
                  <td>{g.count}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      )}
    </ChartCard>
  );
}

function DisplacementChart({ slug, batch }: { slug: string; batch: BatchDetail }) {
  const histogram = useDisplacementHistogram(slug, batch.id, batch.status);
  const budget = batch.settings.displacementBudget;
  const bins = histogram.data ? displacementHistogram(histogram.data, budget) : [];
  // Unfinished and failed structures have no displacement; say so when the bars leave some out.
  const missing = histogram.data ? histogram.data.total - histogram.data.counted : 0;
  const budgetNote = `budget ${formatAngstrom(budget, 3)} (bin in ochre)`;
  const note =
    histogram.data && missing > 0
      ? `${formatCount(histogram.data.counted)} of ${formatCount(histogram.data.total)} structures have a value · ${budgetNote}`
      : budgetNote;
  return (
    <ChartCard title="Largest displacement per structure (Å, log bins)" note={note}>
      {histogram.isPending ? (
        <div className="flex h-52 items-center justify-center">
          <Spinner label="Reading displacements" />
        </div>
      ) : histogram.error ? (
        <InlineError>Displacements could not be read: {histogram.error.message}</InlineError>
      ) : bins.every((b) => b.count === 0) ? (
        <p className="py-10 text-center text-sm text-ink-soft">No structure has finished yet.</p>
      ) : (
        <>
          <div className="h-52" aria-hidden>
            <ResponsiveContainer width="100%" height="100%" initialDimension={{ width: 520, height: 208 }}>
              <BarChart data={bins} margin={{ top: 8, right: 8, bottom: 4, left: 0 }}>
                <CartesianGrid vertical={false} stroke={RULE} />
                <XAxis dataKey="label" tick={{ ...tick, fontSize: 10 }} interval={0} angle={-30} textAnchor="end" height={48} />
                <YAxis allowDecimals={false} tick={tick} width={40} />
                <Tooltip formatter={(v) => [formatCount(Number(v)), 'structures']} labelFormatter={(l) => `${l} Å`} />
                <Bar dataKey="count" radius={[3, 3, 0, 0]} isAnimationActive={false}>
                  {bins.map((b) => (
                    <Cell key={b.label} fill={b.holdsBudget ? OCHRE : b.from >= budget ? SAFFRON : LAPIS} />
                  ))}
                </Bar>
              </BarChart>
            </ResponsiveContainer>
          </div>
          <p className="text-xs text-ink-soft">
            Bars at or above the budget are saffron; the budget's own bin is ochre.
          </p>
          <table className="sr-only">
            <caption>Structures per range of largest displacement, in Å</caption>
            <tbody>
              {bins.map((b) => (
                <tr key={b.label}>
                  <th scope="row">{b.label} Å{b.holdsBudget ? ' (holds the budget)' : ''}</th>
                  <td>{b.count}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      )}
    </ChartCard>
  );
}
