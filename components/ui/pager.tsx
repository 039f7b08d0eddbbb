import Link from 'next/link';

/** Previous / next links that keep the other query parameters. */
export function Pager({ page, pageSize, total, basePath, params }: { page: number; pageSize: number; total: number; basePath: string; params: Record<string, string | undefined> }) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const href = (p: number) => {
    const search = new URLSearchParams(Object.entries({ ...params, page: String(p) }).filter((e): e is [string, string] => !!e[1]));
    return `${basePath}?${search.toString()}`;
  };
  return (
    <nav aria-label="Pages" className="mt-4 flex items-center justify-between text-sm">
      <span className="text-brine num">
        {total === 0 ? 'Nothing to show' : `${(page - 1) * pageSize + 1}–${Math.min(page * pageSize, total)} of ${total}`}
      </span>
      <span className="flex gap-3">
        {page > 1 ? <Link href={href(page - 1)}>← Previous</Link> : <span className="text-brine/60">← Previous</span>}
        <span className="num">
          Page {Math.min(page, pages)} of {pages}
        </span>
        {page < pages ? <Link href={href(page + 1)}>Next →</Link> : <span className="text-brine/60">Next →</span>}
      </span>
    </nav>
  );
}
