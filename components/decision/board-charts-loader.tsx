'use client';

import dynamic from 'next/dynamic';

// The charting library is loaded only on this page, in the browser.
const loading = () => <div className="flex h-64 items-center justify-center text-sm text-brine">Drawing the chart…</div>;

export const DecisionsByMonthChart = dynamic(() => import('./board-charts').then((m) => m.DecisionsByMonthChart), { ssr: false, loading });
export const DecisionsByLaboratoryChart = dynamic(() => import('./board-charts').then((m) => m.DecisionsByLaboratoryChart), { ssr: false, loading });
export const InstrumentChart = dynamic(() => import('./board-charts').then((m) => m.InstrumentChart), { ssr: false, loading });
export const SupplierHistoryChart = dynamic(() => import('./board-charts').then((m) => m.SupplierHistoryChart), { ssr: false, loading });
