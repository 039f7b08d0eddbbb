'use client';

import { Bar, BarChart, CartesianGrid, Legend, Line, ReferenceLine, ResponsiveContainer, Scatter, ComposedChart, Tooltip, XAxis, YAxis } from 'recharts';
import type { BoardOverview } from '@/lib/dal/decision-board';

// Outcome colours with distinct patterns of meaning in the legend and the tables beside each chart,
// so no reading rests on colour alone.
const outcomeColours = { uphold: '#a23b1c', reverse: '#2f6b2f', adjust: '#7a4f00' } as const;
const outcomeNames = { uphold: 'upheld', reverse: 'reversed', adjust: 'adjusted' } as const;
const instrumentColours = ['#0f6f73', '#7a4f00', '#4b5a6b', '#a23b1c'];
const fmt = (v: number) => v.toFixed(3).replace('-', '−');

function OutcomeBars({ data, category, layout = 'horizontal' }: { data: Record<string, string | number>[]; category: string; layout?: 'horizontal' | 'vertical' }) {
  const vertical = layout === 'vertical';
  return (
    <div className="h-64 w-full">
      <ResponsiveContainer>
        <BarChart data={data} layout={layout} margin={{ top: 10, right: 20, bottom: 10, left: vertical ? 140 : 0 }}>
          <CartesianGrid stroke="#d9d2c3" strokeDasharray="3 3" />
          {vertical ? <XAxis type="number" allowDecimals={false} /> : <XAxis dataKey={category} />}
          {vertical ? <YAxis type="category" dataKey={category} width={140} /> : <YAxis allowDecimals={false} />}
          <Tooltip />
          <Legend verticalAlign="top" />
          {(['uphold', 'reverse', 'adjust'] as const).map((outcome) => (
            <Bar key={outcome} dataKey={outcome} name={outcomeNames[outcome]} stackId="outcome" fill={outcomeColours[outcome]} />
          ))}
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}

export function DecisionsByMonthChart({ data }: { data: BoardOverview['byMonth'] }) {
  return <OutcomeBars data={data} category="month" />;
}

export function DecisionsByLaboratoryChart({ data }: { data: BoardOverview['byLaboratory'] }) {
  return <OutcomeBars data={data} category="laboratory" layout="vertical" />;
}

/** How many of each instrument's contested intake results the board reversed or adjusted, month by month. */
export function InstrumentChart({ data }: { data: BoardOverview['byInstrument'] }) {
  const months = [...new Set(data.flatMap((i) => i.months.map((m) => m.month)))].sort();
  const rows = months.map((month) => {
    const row: Record<string, string | number> = { month };
    for (const i of data) {
      const m = i.months.find((x) => x.month === month);
      row[i.instrument] = m ? m.reverse + m.adjust : 0;
    }
    return row;
  });
  return (
    <div className="h-64 w-full">
      <ResponsiveContainer>
        <BarChart data={rows} margin={{ top: 10, right: 20, bottom: 10, left: 0 }}>
          <CartesianGrid stroke="#d9d2c3" strokeDasharray="3 3" />
          <XAxis dataKey="month" />
          <YAxis allowDecimals={false} />
          <Tooltip />
          <Legend verticalAlign="top" />
          {data.map((i, index) => (
            <Bar key={i.instrument} dataKey={i.instrument} name={`${i.instrument}: reversed or adjusted`} fill={instrumentColours[index % instrumentColours.length]} />
          ))}
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}

/** One supplier's daily mean and warmest intake result against the limit, with its disputed loads. */
export function SupplierHistoryChart({ supplier, limit }: { supplier: BoardOverview['suppliers'][number]; limit: number | null }) {
  const byDay = new Map<string, { day: string; mean?: number; warmest?: number; disputed?: number }>();
  for (const d of supplier.days) byDay.set(d.day, { day: d.day, mean: d.mean, warmest: d.warmest });
  for (const d of supplier.disputed) byDay.set(d.day, { ...(byDay.get(d.day) ?? { day: d.day }), disputed: d.value });
  const rows = [...byDay.values()].sort((a, b) => a.day.localeCompare(b.day));
  const values = rows.flatMap((r) => [r.mean, r.warmest, r.disputed]).filter((v): v is number => v !== undefined).concat(limit ?? []);
  // Whole steps of 5 m°C, so the axis reads like a laboratory's and not like a float.
  const lo = Math.floor((Math.min(...values) - 0.001) * 200) / 200;
  const hi = Math.ceil((Math.max(...values) + 0.001) * 200) / 200;
  return (
    <figure aria-label={`Freezing-point history of ${supplier.name} against the limit`}>
      <div className="h-64 w-full">
        <ResponsiveContainer>
          <ComposedChart data={rows} margin={{ top: 24, right: 90, bottom: 10, left: 10 }}>
            <CartesianGrid stroke="#d9d2c3" strokeDasharray="3 3" />
            <XAxis dataKey="day" tickFormatter={(d: string) => d.slice(5)} minTickGap={24} />
            <YAxis domain={[lo, hi]} tickFormatter={fmt} width={60} label={{ value: '°C', position: 'insideTopLeft', offset: -18, fontSize: 11 }} />
            <Tooltip formatter={(value) => (typeof value === 'number' ? `${fmt(value)} °C` : String(value))} />
            <Legend verticalAlign="top" />
            {limit !== null ? <ReferenceLine y={limit} stroke="#a23b1c" strokeWidth={2} label={{ value: `limit ${fmt(limit)}`, position: 'right', fill: '#a23b1c', fontSize: 11 }} /> : null}
            <Line type="monotone" dataKey="mean" name="daily mean" stroke="#0f6f73" strokeWidth={2} dot={false} connectNulls />
            <Line type="monotone" dataKey="warmest" name="warmest load of the day" stroke="#4b5a6b" strokeDasharray="4 3" dot={false} connectNulls />
            <Scatter dataKey="disputed" name="disputed load" fill="#7a4f00" shape="diamond" />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-brine">Warmer (less negative) is up; above the red line a load is suspected of added water. Diamonds: loads disputed before this board.</figcaption>
    </figure>
  );
}
