'use client';

import dynamic from 'next/dynamic';
import type { ComponentProps } from 'react';
import type { ReadingsChart as Chart } from './readings-chart';

// The charting library is loaded only where a chart is shown, keeping it out of every other page's bundle.
const ReadingsChart = dynamic(() => import('./readings-chart').then((m) => m.ReadingsChart), {
  ssr: false,
  loading: () => <div className="flex h-72 items-center justify-center text-sm text-brine">Drawing the chart…</div>,
});

export function ReadingsChartLoader(props: ComponentProps<typeof Chart>) {
  return <ReadingsChart {...props} />;
}
