import Link from 'next/link';

/**
 * Previous / next links that keep the other query parameters. `moreThanTotal` says the list was
 * counted only up to `total` (long lists are not counted to the end on every page view).
 */
export function Pager({
  page,
  pageSize,
  total,
  moreThanTotal = false,
  basePath,
  params,
}: {
  page: number;
  pageSize: number;
  total: number;
  moreThanTotal?: boolean;
  basePath: string;
  params: Record<string, string | undefined>;
}) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const href = (p: number) => {
    const search = new URLSearchParams(Object.entries({ ...params, page: String(p) }).filter((e): e is [string, string] => !!e[1]));
    return `${basePath}?${search.toString()}`;
  };
  return (
    <nav aria-label="Pages" className="mt-4 flex items-center justify-between text-sm">
      <span className="text-brine num">
        {total === 0 ? 'Nothing to show' : `${(page - 1) * pageSize + 1}–${Math.min(page * pageSize, total)} of ${moreThanTotal ? `more than ${total.toLocaleString('en-GB')}` : total}`}
        {moreThanTotal ? <span className="block text-xs">Narrow the list by farm or verdict to see further back.</span> : null}
      </span>
      <span className="flex gap-3">
        {page > 1 ? <Link href={href(page - 1)}>← Previous</Link> : <span className="text-brine/60">← Previous</span>}
        <span className="num">
          Page {Math.min(page, pages)} of {pages}
          {moreThanTotal ? '+' : ''}
        </span>
        {page < pages ? <Link href={href(page + 1)}>Next →</Link> : <span className="text-brine/60">Next →</span>}
      </span>
    </nav>
  );
}
