'use client';

import dynamic from 'next/dynamic';
import { useEffect, useRef, useState, type ComponentProps } from 'react';
import type { ReadingsChart as Chart } from './readings-chart';

const placeholderClass = 'flex h-72 items-center justify-center text-sm text-brine';

// The charting library is loaded only where a chart is shown, keeping it out of every other page's bundle.
const ReadingsChart = dynamic(() => import('./readings-chart').then((m) => m.ReadingsChart), {
  ssr: false,
  loading: () => <div className={placeholderClass}>Drawing the chart…</div>,
});

/** True once the element comes near the viewport; browsers without IntersectionObserver get true at once. */
function useNearViewport<T extends Element>() {
  const ref = useRef<T>(null);
  const [near, setNear] = useState(false);
  useEffect(() => {
    const element = ref.current;
    if (!element || near) return;
    if (typeof IntersectionObserver === 'undefined') {
      setNear(true);
      return;
    }
    const observer = new IntersectionObserver(
      (entries) => {
        if (entries.some((entry) => entry.isIntersecting)) setNear(true);
      },
      // A little ahead of the scroll, so the chart is usually drawn by the time it is reached.
      { rootMargin: '200px 0px' },
    );
    observer.observe(element);
    return () => observer.disconnect();
  }, [near]);
  return [ref, near] as const;
}

// The caption is plain text, so it comes with the page's HTML instead of after the charting library:
// drawn late, it was the case page's largest paint. The library itself waits until the figure is
// about to be seen; until then, and without JavaScript, the caption and the review's figures stand.
export function ReadingsChartLoader(props: ComponentProps<typeof Chart>) {
  const [ref, near] = useNearViewport<HTMLElement>();
  return (
    <figure ref={ref} aria-label="Readings of both laboratories against the repeatability limit, the critical difference and the limit">
      {near ? <ReadingsChart {...props} /> : <div className={placeholderClass} aria-hidden="true" />}
      <figcaption className="text-xs text-brine">
        Dashed boxes: each result ± r/2 (repeatability). Shaded: the critical difference around the mean of both results; both results inside it means the laboratories agree. Red: the limit, and the acceptance limit after the guard band. Warmer (less negative) is up.
      </figcaption>
    </figure>
  );
}
