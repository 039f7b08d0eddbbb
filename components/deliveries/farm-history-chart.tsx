'use client';

import { CartesianGrid, Line, LineChart, ReferenceArea, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';

export type HistoryPoint = { at: number; value: number; verdict: 'accepted' | 'deducted' | 'rejected'; disputed: boolean; reference: string; rulesVersion: number };

const fmt = (v: number) => `${v.toFixed(3).replace('-', '−')}`;
const day = (t: number) => new Date(t).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', timeZone: 'UTC' });
const colour = { accepted: '#2f6b2f', deducted: '#7a4f00', rejected: '#a23b1c' } as const;

type DotProps = { cx?: number; cy?: number; payload?: HistoryPoint };

/** Accepted loads as small circles, deductions and rejections as larger squares, disputed ones ringed. */
function Dot({ cx, cy, payload }: DotProps) {
  if (cx === undefined || cy === undefined || !payload) return null;
  const fill = colour[payload.verdict];
  const mark =
    payload.verdict === 'accepted' ? <circle cx={cx} cy={cy} r={3} fill={fill} /> : <rect x={cx - 4.5} y={cy - 4.5} width={9} height={9} fill={fill} />;
  return (
    <g>
      {mark}
      {payload.disputed ? <circle cx={cx} cy={cy} r={8} fill="none" stroke="#0f6f73" strokeWidth={2} /> : null}
    </g>
  );
}

/** A farm's freezing point, load by load, against the scheme's limit and the herd's own usual range. */
export function FarmHistoryChart({ points, upper, lower, range }: { points: HistoryPoint[]; upper: number; lower: number | null; range: { low: number; high: number } | null }) {
  const values = points.map((p) => p.value).concat(upper, range?.low ?? upper);
  // Ticks every 5 m°C on round values, so the axis reads like the limits it is compared with.
  const step = 0.005;
  const lo = Math.floor((Math.min(...values) - 0.002) / step) * step;
  const hi = Math.ceil((Math.max(...values) + 0.002) / step) * step;
  const ticks = Array.from({ length: Math.round((hi - lo) / step) + 1 }, (_, i) => Number((lo + i * step).toFixed(3)));
  return (
    <figure aria-label="Freezing point of each delivery against the limit">
      <div className="h-72 w-full">
        <ResponsiveContainer>
          <LineChart data={points} margin={{ top: 10, right: 100, bottom: 10, left: 10 }}>
            <CartesianGrid stroke="#d9d2c3" strokeDasharray="3 3" />
            <XAxis dataKey="at" type="number" scale="time" domain={['dataMin', 'dataMax']} tickFormatter={day} />
            <YAxis type="number" domain={[lo, hi]} ticks={ticks} tickFormatter={fmt} unit=" °C" width={90} />
            <Tooltip
              labelFormatter={(label) => (typeof label === 'number' ? new Date(label).toUTCString().slice(0, 22) + ' UTC' : String(label))}
              formatter={(value, _name, item) => {
                const p = (item as { payload?: HistoryPoint }).payload;
                return [`${typeof value === 'number' ? fmt(value) : value} °C${p ? ` · ${p.verdict}${p.disputed ? ', disputed' : ''} · ${p.reference} · rules v${p.rulesVersion}` : ''}`, 'Freezing point'];
              }}
            />
            {range ? <ReferenceArea y1={range.low} y2={range.high} fill="#dcefee" fillOpacity={0.6} label={{ value: 'usual range', position: 'right', fontSize: 11 }} /> : null}
            <ReferenceLine y={upper} stroke="#a23b1c" strokeWidth={2} label={{ value: `limit ${fmt(upper)} °C`, position: 'right', fill: '#a23b1c', fontSize: 11 }} />
            {lower !== null && lower > lo ? <ReferenceLine y={lower} stroke="#a23b1c" strokeDasharray="6 3" label={{ value: `lower ${fmt(lower)} °C`, position: 'right', fill: '#a23b1c', fontSize: 11 }} /> : null}
            <Line type="linear" dataKey="value" stroke="#4b5a6b" strokeWidth={1} dot={<Dot />} isAnimationActive={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-brine">
        Each point is one delivery’s intake result; warmer (less negative) is up. Squares: deducted or rejected loads; a ring marks a disputed load. Red line: the scheme’s upper limit in force now (each
        result was judged under its own rules version). Shaded: the middle 90 % of this herd’s accepted loads.
      </figcaption>
    </figure>
  );
}
