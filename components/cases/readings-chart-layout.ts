import { scaleLinear } from 'd3-scale';
import { celsius } from '@/lib/arbitration/format';

/** One laboratory's readings in °C and its accepted result, if it has one. */
export type ChartSet = { label: string; readings: number[]; result: number | null };
export type ChartInput = { sets: ChartSet[]; r: number; criticalDifference: number | null; limit: number; acceptanceLimit: number | null };

export const CHART_WIDTH = 800;
export const CHART_HEIGHT = 320;
// Room for "−0.520 °C" ticks and the axis title on the left, and the lines' labels on the right.
const plot = { left: 96, right: CHART_WIDTH - 170, top: 14, bottom: CHART_HEIGHT - 46 };
// Beyond the outermost value, so no mark or box sits on the frame.
const PADDING_C = 0.004;
// Side-by-side offset of the two laboratories' marks of one reading number, in reading numbers.
const OFFSET = 0.08;
const LABEL_GAP = 14;

export type Mark = { set: number; reading: number; value: number; x: number; y: number; title: string };
export type Band = { y1: number; y2: number; title: string };
export type ReferenceLine = { kind: 'limit' | 'acceptance'; y: number; title: string };
export type SideLabel = { text: string; y: number; kind: 'limit' | 'acceptance' | 'critical_difference' };

export type ChartLayout = {
  plot: typeof plot;
  xTicks: { value: number; x: number }[];
  yTicks: { label: string; y: number }[];
  marks: Mark[];
  resultBands: (Band & { set: number })[];
  criticalBand: Band | null;
  lines: ReferenceLine[];
  labels: SideLabel[];
  summary: string;
};

/** Pushes labels apart to at least LABEL_GAP, keeping them inside the plot's height, in their order. */
function spread(labels: SideLabel[]): SideLabel[] {
  const sorted = [...labels].sort((a, b) => a.y - b.y).map((label) => ({ ...label }));
  for (let i = 1; i < sorted.length; i++) sorted[i].y = Math.max(sorted[i].y, sorted[i - 1].y + LABEL_GAP);
  for (let i = sorted.length - 1; i >= 0; i--) {
    const ceiling = i === sorted.length - 1 ? plot.bottom : sorted[i + 1].y - LABEL_GAP;
    sorted[i].y = Math.max(plot.top, Math.min(sorted[i].y, ceiling));
  }
  return sorted;
}

/**
 * Positions of everything the readings chart draws, in the coordinates of its viewBox. Warmer
 * (less negative) is up; the temperature axis spans every reading, box, band and limit.
 */
export function readingsChartLayout({ sets, r, criticalDifference, limit, acceptanceLimit }: ChartInput): ChartLayout {
  const results = sets.map((s) => s.result).filter((v): v is number => v !== null);
  const mean = results.length === 2 ? (results[0] + results[1]) / 2 : null;
  const critical = mean !== null && criticalDifference !== null ? { low: mean - criticalDifference / 2, high: mean + criticalDifference / 2 } : null;
  const acceptance = acceptanceLimit !== null && Math.abs(acceptanceLimit - limit) > 1e-9 ? acceptanceLimit : null;

  const values = [...sets.flatMap((s) => s.readings), ...results.flatMap((v) => [v - r / 2, v + r / 2]), limit, ...(acceptance !== null ? [acceptance] : []), ...(critical ? [critical.low, critical.high] : [])];
  const y = scaleLinear()
    .domain([Math.min(...values) - PADDING_C, Math.max(...values) + PADDING_C])
    .range([plot.bottom, plot.top])
    .nice(6);
  const readingCount = Math.max(4, ...sets.map((s) => s.readings.length));
  const x = scaleLinear().domain([0.5, readingCount + 0.5]).range([plot.left, plot.right]);

  const marks = sets.flatMap((s, set) =>
    s.readings.map((value, j) => ({
      set,
      reading: j + 1,
      value,
      x: x(j + 1 + (sets.length > 1 ? (set === 0 ? -OFFSET : OFFSET) : 0)),
      y: y(value),
      title: `${s.label}, reading ${j + 1}: ${celsius(value)}`,
    })),
  );
  const resultBands = sets.flatMap((s, set) =>
    s.result === null ? [] : [{ set, y1: y(s.result + r / 2), y2: y(s.result - r / 2), title: `${s.label}: result ${celsius(s.result)}, ± r/2 from ${celsius(s.result - r / 2)} to ${celsius(s.result + r / 2)}` }],
  );
  const criticalBand = critical && mean !== null ? { y1: y(critical.high), y2: y(critical.low), title: `Critical difference around the mean ${celsius(mean)} of both results: ${celsius(critical.low)} to ${celsius(critical.high)}` } : null;
  const lines: ReferenceLine[] = [{ kind: 'limit', y: y(limit), title: `Limit ${celsius(limit)}` }];
  if (acceptance !== null) lines.push({ kind: 'acceptance', y: y(acceptance), title: `Acceptance limit ${celsius(acceptance)}, after the guard band` });

  const labels = spread([
    { kind: 'limit', text: `limit ${celsius(limit)}`, y: y(limit) },
    ...(acceptance !== null ? [{ kind: 'acceptance' as const, text: `acceptance ${celsius(acceptance)}`, y: y(acceptance) }] : []),
    ...(criticalBand ? [{ kind: 'critical_difference' as const, text: 'critical difference', y: (criticalBand.y1 + criticalBand.y2) / 2 }] : []),
  ]);

  const summary = [
    'Freezing point in °C against reading number.',
    ...sets.map((s) => `${s.label}: readings ${s.readings.map(celsius).join(', ') || 'none'}; ${s.result === null ? 'no accepted result' : `result ${celsius(s.result)} ± r/2`}.`),
    ...(criticalBand ? [`${criticalBand.title}.`] : []),
    ...lines.map((line) => `${line.title}.`),
  ].join(' ');

  return {
    plot,
    xTicks: Array.from({ length: readingCount }, (_, i) => ({ value: i + 1, x: x(i + 1) })),
    yTicks: y.ticks(6).map((value) => ({ label: celsius(value), y: y(value) })),
    marks,
    resultBands,
    criticalBand,
    lines,
    labels,
    summary,
  };
}
