'use client';

import dynamic from 'next/dynamic';
import type { ComponentProps } from 'react';
import type { ReadingsChart as Chart } from './readings-chart';

// The charting library is loaded only where a chart is shown, keeping it out of every other page's bundle.
const ReadingsChart = dynamic(() => import('./readings-chart').then((m) => m.ReadingsChart), {
  ssr: false,
  loading: () => <div className="flex h-72 items-center justify-center text-sm text-brine">Drawing the chart…</div>,
});

// The caption is plain text, so it comes with the page's HTML instead of after the charting library:
// drawn late, it was the case page's largest paint.
export function ReadingsChartLoader(props: ComponentProps<typeof Chart>) {
  return (
    <figure aria-label="Readings of both laboratories against the repeatability limit, the critical difference and the limit">
      <ReadingsChart {...props} />
      <figcaption className="text-xs text-brine">
        Dashed boxes: each result ± r/2 (repeatability). Shaded: the critical difference around the mean of both results; both results inside it means the laboratories agree. Red: the limit, and the acceptance limit after the guard band. Warmer (less negative) is up.
      </figcaption>
    </figure>
  );
}
