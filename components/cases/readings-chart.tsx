import type { ReactNode } from 'react';
import { CHART_HEIGHT, CHART_WIDTH, readingsChartLayout, type ChartInput } from './readings-chart-layout';

// One colour and one shape per laboratory, so the marks differ without colour too.
const setStyles = [
  { mark: 'fill-frost', box: 'stroke-frost', shape: 'circle' },
  { mark: 'fill-amber', box: 'stroke-amber', shape: 'diamond' },
] as const;

function Shape({ shape, x, y, className, children }: { shape: 'circle' | 'diamond'; x: number; y: number; className: string; children?: ReactNode }) {
  if (shape === 'circle') {
    return (
      <circle cx={x} cy={y} r={5} className={className}>
        {children}
      </circle>
    );
  }
  return (
    <path d={`M${x} ${y - 6.5}L${x + 6.5} ${y}L${x} ${y + 6.5}L${x - 6.5} ${y}Z`} className={className}>
      {children}
    </path>
  );
}

/**
 * Both laboratories' readings on one temperature axis, with each result's repeatability box (± r/2),
 * the band of the critical difference around their mean, and the limit with its acceptance limit.
 * Drawn on the server as SVG: no script, and each mark names its value as a native tooltip.
 */
export function ReadingsChart(props: ChartInput) {
  const layout = readingsChartLayout(props);
  const { plot } = layout;
  const styleOf = (set: number) => setStyles[set % setStyles.length];
  return (
    <div>
      <ul className="mb-1 flex flex-wrap gap-x-5 gap-y-1 text-sm" aria-hidden="true">
        {props.sets.map((s, set) => (
          <li key={s.label} className="flex items-center gap-1.5">
            <svg width="14" height="14" viewBox="0 0 14 14">
              <Shape shape={styleOf(set).shape} x={7} y={7} className={styleOf(set).mark} />
            </svg>
            {s.label}
          </li>
        ))}
      </ul>
      {/* Below this width the labels would shrink past reading; the figure scrolls instead. */}
      <div className="overflow-x-auto">
        <svg viewBox={`0 0 ${CHART_WIDTH} ${CHART_HEIGHT}`} className="h-auto w-full min-w-[520px] max-w-4xl text-[12px]" role="img" aria-label={layout.summary}>
          <g className="stroke-line" strokeDasharray="3 3">
            {layout.yTicks.map((tick) => (
              <line key={tick.label} x1={plot.left} x2={plot.right} y1={tick.y} y2={tick.y} />
            ))}
            {layout.xTicks.map((tick) => (
              <line key={tick.value} x1={tick.x} x2={tick.x} y1={plot.top} y2={plot.bottom} />
            ))}
          </g>
          {layout.criticalBand ? (
            <rect x={plot.left} width={plot.right - plot.left} y={layout.criticalBand.y1} height={layout.criticalBand.y2 - layout.criticalBand.y1} className="fill-frost-soft" fillOpacity={0.8}>
              <title>{layout.criticalBand.title}</title>
            </rect>
          ) : null}
          {layout.resultBands.map((band) => (
            <rect key={band.set} x={plot.left} width={plot.right - plot.left} y={band.y1} height={band.y2 - band.y1} fill="none" strokeDasharray="4 2" strokeWidth={1.5} className={styleOf(band.set).box}>
              <title>{band.title}</title>
            </rect>
          ))}
          {layout.lines.map((line) => (
            <line key={line.kind} x1={plot.left} x2={plot.right} y1={line.y} y2={line.y} className="stroke-rust" strokeWidth={line.kind === 'limit' ? 2 : 1.5} strokeDasharray={line.kind === 'limit' ? undefined : '6 3'}>
              <title>{line.title}</title>
            </line>
          ))}
          {layout.marks.map((mark) => (
            <Shape key={`${mark.set}-${mark.reading}`} shape={styleOf(mark.set).shape} x={mark.x} y={mark.y} className={styleOf(mark.set).mark}>
              <title>{mark.title}</title>
            </Shape>
          ))}

          <g className="stroke-brine">
            <line x1={plot.left} x2={plot.left} y1={plot.top} y2={plot.bottom} />
            <line x1={plot.left} x2={plot.right} y1={plot.bottom} y2={plot.bottom} />
          </g>
          <g className="fill-ink-soft">
            {layout.yTicks.map((tick) => (
              <text key={tick.label} x={plot.left - 6} y={tick.y} textAnchor="end" dominantBaseline="middle" className="num">
                {tick.label}
              </text>
            ))}
            {layout.xTicks.map((tick) => (
              <text key={tick.value} x={tick.x} y={plot.bottom + 16} textAnchor="middle" className="num">
                {tick.value}
              </text>
            ))}
            <text x={(plot.left + plot.right) / 2} y={plot.bottom + 36} textAnchor="middle">
              reading number
            </text>
            <text transform={`translate(14 ${(plot.top + plot.bottom) / 2}) rotate(-90)`} textAnchor="middle" dominantBaseline="middle">
              freezing point
            </text>
          </g>
          {layout.labels.map((label) => (
            <text key={label.kind} x={plot.right + 8} y={label.y} dominantBaseline="middle" className={label.kind === 'critical_difference' ? 'fill-frost-dark text-[11px]' : 'fill-rust text-[11px]'}>
              {label.text}
            </text>
          ))}
        </svg>
      </div>
    </div>
  );
}
