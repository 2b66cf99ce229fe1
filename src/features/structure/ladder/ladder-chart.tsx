import { Bar, BarChart, CartesianGrid, Cell, LabelList, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { LadderRungJson } from '@shared/contracts/structure';
import { formatAngstrom } from '@/lib/format';
import { formatTolerance, ladderBars } from './ladder-data';

const LAPIS = '#2b4c9b';
const SAFFRON = '#d98e1f';
const INK = '#1c2230';
const INK_SOFT = '#4a5264';
const RULE = '#d8d2c4';
const mono = 'JetBrains Mono, monospace';

/**
 * The ladder as a chart: one horizontal bar per rung spanning the tolerances (log axis, Å) at
 * which that group is perceived, labelled with what snapping to it costs (displacement RMSD).
 * The chosen group is saffron; the structure's tolerance is the dashed line. Lazy-loaded.
 */
export function LadderChart({ ladder, chosen, tolerance }: { ladder: LadderRungJson[]; chosen: string; tolerance: number }) {
  const data = ladderBars(ladder);
  const lo = Math.min(...data.map((d) => d.range[0]));
  const hi = Math.max(...data.map((d) => d.range[1]));
  const groupOf = new Map(data.map((d) => [d.key, d.group]));
  return (
    <div className="h-full w-full" aria-hidden>
      <ResponsiveContainer width="100%" height="100%" initialDimension={{ width: 520, height: 208 }}>
        <BarChart data={data} layout="vertical" margin={{ top: 20, right: 96, bottom: 18, left: 4 }}>
          <CartesianGrid horizontal={false} stroke={RULE} />
          <XAxis
            type="number"
            scale="log"
            domain={[lo, hi]}
            allowDataOverflow
            ticks={[1e-4, 1e-3, 1e-2, 1e-1].filter((t) => t >= lo && t <= hi)}
            tickFormatter={(v: number) => formatTolerance(v)}
            tick={{ fill: INK_SOFT, fontSize: 11, fontFamily: mono }}
            label={{ value: 'tolerance (Å, log)', position: 'insideBottom', offset: -12, fill: INK_SOFT, fontSize: 11 }}
          />
          <YAxis type="category" dataKey="key" width={52} tickFormatter={(k: string) => groupOf.get(k) ?? k} tick={{ fill: INK, fontSize: 13, fontStyle: 'italic' }} />
          <Tooltip
            formatter={(_v, _n, item) => {
              const p = item.payload as (typeof data)[number];
              return [`${formatTolerance(p.range[0])}–${formatTolerance(p.range[1])} Å · RMSD ${formatAngstrom(p.cost)} · max ${formatAngstrom(p.max)}`, p.group];
            }}
            labelFormatter={() => ''}
          />
          <ReferenceLine x={tolerance} stroke={INK_SOFT} strokeDasharray="4 3" label={{ value: 'your tolerance', position: 'top', fill: INK_SOFT, fontSize: 10 }} />
          <Bar dataKey="range" isAnimationActive={false} barSize={16} radius={3}>
            {data.map((d) => (
              <Cell key={d.key} fill={d.group === chosen ? SAFFRON : LAPIS} />
            ))}
            <LabelList
              dataKey="cost"
              position="right"
              formatter={(v: unknown) => `RMSD ${formatAngstrom(Number(v))}`}
              style={{ fill: INK, fontSize: 10, fontFamily: mono }}
            />
          </Bar>
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}
