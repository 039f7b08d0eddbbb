import { describe, expect, it } from 'vitest';
import { renderToStaticMarkup } from 'react-dom/server';
import { ReadingsChart } from '@/components/cases/readings-chart';
import { readingsChartLayout, type ChartInput } from '@/components/cases/readings-chart-layout';

// Invented readings in °C: a plant laboratory's two, a referee laboratory's four about 24 m°C colder,
// r = 4 m°C, a limit of −0.520 °C with an acceptance limit 1.5 m°C inside it.
const disagreeing: ChartInput = {
  sets: [
    { label: 'Plant laboratory', readings: [-0.5031, -0.5037], result: -0.5034 },
    { label: 'Referee laboratory', readings: [-0.5271, -0.5279, -0.5276, -0.5274], result: -0.5275 },
  ],
  r: 0.004,
  criticalDifference: 0.0069,
  limit: -0.52,
  acceptanceLimit: -0.5185,
};

/** The temperature an SVG y stands for, from two ticks' positions (the axis is linear). */
function valueAt(layout: ReturnType<typeof readingsChartLayout>, y: number): number {
  const [a, b] = layout.yTicks;
  const va = Number(a.label.replace('−', '-').replace(' °C', ''));
  const vb = Number(b.label.replace('−', '-').replace(' °C', ''));
  return va + ((y - a.y) * (vb - va)) / (b.y - a.y);
}

describe('readings chart layout', () => {
  const layout = readingsChartLayout(disagreeing);

  it('puts every reading where its value lies on the temperature axis, warmer up', () => {
    expect(layout.marks).toHaveLength(6);
    for (const mark of layout.marks) expect(valueAt(layout, mark.y)).toBeCloseTo(mark.value, 6);
    const plant = layout.marks.filter((m) => m.set === 0);
    const referee = layout.marks.filter((m) => m.set === 1);
    // The plant's readings are warmer (less negative): higher up, so a smaller y.
    expect(Math.max(...plant.map((m) => m.y))).toBeLessThan(Math.min(...referee.map((m) => m.y)));
    // Reading 1 of both laboratories sits left of reading 2, each a little to its own side.
    expect(plant[0].x).toBeLessThan(referee[0].x);
    expect(referee[0].x).toBeLessThan(plant[1].x);
  });

  it('draws each result ± r/2 and the critical difference around the mean of both results', () => {
    expect(layout.resultBands).toHaveLength(2);
    const [plantBand, refereeBand] = layout.resultBands;
    expect(valueAt(layout, plantBand.y1)).toBeCloseTo(-0.5034 + 0.002, 6);
    expect(valueAt(layout, plantBand.y2)).toBeCloseTo(-0.5034 - 0.002, 6);
    expect(valueAt(layout, refereeBand.y1)).toBeCloseTo(-0.5275 + 0.002, 6);
    const mean = (-0.5034 + -0.5275) / 2;
    expect(layout.criticalBand).not.toBeNull();
    expect(valueAt(layout, layout.criticalBand!.y1)).toBeCloseTo(mean + 0.0069 / 2, 6);
    expect(valueAt(layout, layout.criticalBand!.y2)).toBeCloseTo(mean - 0.0069 / 2, 6);
  });

  it('draws the limit and the acceptance limit, and labels each without overlap', () => {
    expect(layout.lines.map((l) => l.kind)).toEqual(['limit', 'acceptance']);
    expect(valueAt(layout, layout.lines[0].y)).toBeCloseTo(-0.52, 6);
    expect(valueAt(layout, layout.lines[1].y)).toBeCloseTo(-0.5185, 6);
    expect(layout.labels.map((l) => l.text).sort()).toEqual(['acceptance −0.5185 °C', 'critical difference', 'limit −0.520 °C']);
    const ys = layout.labels.map((l) => l.y).sort((a, b) => a - b);
    for (let i = 1; i < ys.length; i++) expect(ys[i] - ys[i - 1]).toBeGreaterThanOrEqual(14);
    for (const y of ys) {
      expect(y).toBeGreaterThanOrEqual(layout.plot.top);
      expect(y).toBeLessThanOrEqual(layout.plot.bottom);
    }
  });

  it('keeps everything it draws inside the plot', () => {
    const ys = [...layout.marks.map((m) => m.y), ...layout.resultBands.flatMap((b) => [b.y1, b.y2]), layout.criticalBand!.y1, layout.criticalBand!.y2, ...layout.lines.map((l) => l.y)];
    for (const y of ys) {
      expect(y).toBeGreaterThan(layout.plot.top);
      expect(y).toBeLessThan(layout.plot.bottom);
    }
    // Ticks in °C on the temperature axis, warmest at the top; reading numbers 1 to 4 along the other.
    expect(layout.yTicks.length).toBeGreaterThanOrEqual(4);
    for (let i = 1; i < layout.yTicks.length; i++) expect(layout.yTicks[i].y).toBeLessThan(layout.yTicks[i - 1].y);
    expect(layout.yTicks.every((t) => / °C$/.test(t.label))).toBe(true);
    expect(layout.xTicks.map((t) => t.value)).toEqual([1, 2, 3, 4]);
  });

  it('leaves out the band and the acceptance line it has no figures for', () => {
    const one = readingsChartLayout({ sets: [disagreeing.sets[0]], r: 0.004, criticalDifference: null, limit: -0.52, acceptanceLimit: -0.52 });
    expect(one.criticalBand).toBeNull();
    expect(one.lines.map((l) => l.kind)).toEqual(['limit']);
    expect(one.labels.map((l) => l.kind)).toEqual(['limit']);
    expect(one.resultBands).toHaveLength(1);
    const pending = readingsChartLayout({ sets: [disagreeing.sets[0], { label: 'Referee laboratory', readings: [-0.5271, -0.5279], result: null }], r: 0.004, criticalDifference: 0.0069, limit: -0.52, acceptanceLimit: null });
    expect(pending.criticalBand).toBeNull();
    expect(pending.resultBands.map((b) => b.set)).toEqual([0]);
  });
});

describe('ReadingsChart', () => {
  const html = renderToStaticMarkup(<ReadingsChart {...disagreeing} />);

  it('is one SVG image, named by a summary of its figures, scaled by its viewBox', () => {
    expect(html.match(/<svg[^>]*role="img"/g)).toHaveLength(1);
    expect(html).toMatch(/<svg[^>]*viewBox="0 0 800 320"/);
    const label = /role="img" aria-label="([^"]*)"/.exec(html)?.[1] ?? '';
    expect(label).toContain('Referee laboratory: readings −0.5271 °C, −0.5279 °C, −0.5276 °C, −0.5274 °C; result −0.5275 °C ± r/2.');
    expect(label).toContain('Limit −0.520 °C.');
    expect(label).toContain('Acceptance limit −0.5185 °C');
  });

  it('gives every mark, box and line a title, the native tooltip', () => {
    const titles = [...html.matchAll(/<title>([^<]*)<\/title>/g)].map((m) => m[1]);
    // 6 readings, 2 result boxes, 1 critical-difference band, 2 lines.
    expect(titles).toHaveLength(11);
    expect(titles).toContain('Plant laboratory, reading 2: −0.5037 °C');
    expect(titles).toContain('Referee laboratory, reading 4: −0.5274 °C');
    expect(html).toContain('reading number');
    expect(html).toContain('freezing point');
  });

  it('needs no script', () => {
    expect(html).not.toMatch(/<script|on[a-z]+=/i);
  });
});
