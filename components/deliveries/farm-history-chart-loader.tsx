'use client';

import dynamic from 'next/dynamic';
import type { ComponentProps } from 'react';
import type { FarmHistoryChart as Chart } from './farm-history-chart';

// The charting library is loaded only where the history is shown.
const FarmHistoryChart = dynamic(() => import('./farm-history-chart').then((m) => m.FarmHistoryChart), {
  ssr: false,
  loading: () => <div className="flex h-72 items-center justify-center text-sm text-brine">Drawing the chart…</div>,
});

export function FarmHistoryChartLoader(props: ComponentProps<typeof Chart>) {
  return <FarmHistoryChart {...props} />;
}
