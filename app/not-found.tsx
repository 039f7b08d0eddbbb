import Link from 'next/link';

export default function NotFound() {
  return (
    <main id="main" className="mx-auto max-w-xl px-4 py-16">
      <p className="text-sm font-bold uppercase tracking-wide text-brine">Not found</p>
      <h1 className="mt-1 text-2xl font-bold">There is nothing here you can open</h1>
      <p className="mt-3 text-ink-soft">
        The address may be mistyped, or the record belongs to an organisation you are not part of. Records of other organisations
        are never shown.
      </p>
      <p className="mt-6">
        <Link href="/desk">Go to your desk</Link>
      </p>
    </main>
  );
}
