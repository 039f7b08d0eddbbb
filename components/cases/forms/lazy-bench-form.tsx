'use client';

import dynamic from 'next/dynamic';

// Only the referee laboratory's people get the bench form, but every client component a page
// imports shares that page's scripts: imported here, the form and the decision module it runs for
// the live readings helper are a chunk of their own, fetched where the form is drawn. Still
// rendered on the server.
export const LazyBenchForm = dynamic(() => import('./bench-form').then((m) => m.BenchForm));
