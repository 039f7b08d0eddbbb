'use client';

import { CartesianGrid, Legend, ReferenceArea, ReferenceLine, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis } from 'recharts';

export type ChartSet = { label: string; readings: number[]; result: number | null };

const colours = ['#0f6f73', '#7a4f00'];
const shapes = ['circle', 'diamond'] as const;

/**
 * Both laboratories' readings on one temperature axis, with each result's repeatability band (± r/2),
 * the band of the critical difference around their mean, and the limit with its acceptance limit.
 */
export function ReadingsChart({ sets, r, criticalDifference, limit, acceptanceLimit }: { sets: ChartSet[]; r: number; criticalDifference: number | null; limit: number; acceptanceLimit: number | null }) {
  const all = sets.flatMap((s) => s.readings).concat(limit, acceptanceLimit ?? limit);
  const lo = Math.min(...all) - 0.004;
  const hi = Math.max(...all) + 0.004;
  const results = sets.map((s) => s.result).filter((v): v is number => v !== null);
  const mean = results.length === 2 ? (results[0] + results[1]) / 2 : null;
  const fmt = (v: number) => v.toFixed(3).replace('-', '−');
  return (
    <div className="h-72 w-full">
      <ResponsiveContainer>
        <ScatterChart margin={{ top: 10, right: 110, bottom: 10, left: 10 }}>
          <CartesianGrid stroke="#d9d2c3" strokeDasharray="3 3" />
          <XAxis type="number" dataKey="x" name="Reading" domain={[0.5, 4.5]} ticks={[1, 2, 3, 4]} allowDecimals={false} label={{ value: 'reading number', position: 'insideBottom', offset: -4 }} />
          <YAxis type="number" dataKey="y" name="Freezing point" unit=" °C" domain={[lo, hi]} tickFormatter={fmt} width={90} />
          <Tooltip formatter={(value) => (typeof value === 'number' ? `${fmt(value)} °C` : String(value))} />
          <Legend verticalAlign="top" />
          {mean !== null && criticalDifference !== null ? <ReferenceArea y1={mean - criticalDifference / 2} y2={mean + criticalDifference / 2} fill="#dcefee" fillOpacity={0.6} label={{ value: 'critical difference', position: 'right', fontSize: 11 }} /> : null}
          {sets.map((s, i) =>
            s.result === null ? null : <ReferenceArea key={`band-${s.label}`} y1={s.result - r / 2} y2={s.result + r / 2} stroke={colours[i]} strokeDasharray="4 2" fillOpacity={0} />,
          )}
          <ReferenceLine y={limit} stroke="#a23b1c" strokeWidth={2} label={{ value: `limit ${fmt(limit)}`, position: 'right', fill: '#a23b1c', fontSize: 11 }} />
          {acceptanceLimit !== null && Math.abs(acceptanceLimit - limit) > 1e-9 ? (
            <ReferenceLine y={acceptanceLimit} stroke="#a23b1c" strokeDasharray="6 3" label={{ value: `acceptance ${fmt(acceptanceLimit)}`, position: 'right', fill: '#a23b1c', fontSize: 11 }} />
          ) : null}
          {sets.map((s, i) => (
            <Scatter key={s.label} name={s.label} data={s.readings.map((y, j) => ({ x: j + 1 + (i === 0 ? -0.08 : 0.08), y }))} fill={colours[i]} shape={shapes[i]} />
          ))}
        </ScatterChart>
      </ResponsiveContainer>
    </div>
  );
}
