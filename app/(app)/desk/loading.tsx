// Only below pages that every signed-in role may open: a loading boundary above a notFound() would
// turn its 404 into a streamed 200.
export default function Loading() {
  return (
    <div role="status" aria-live="polite" className="flex items-center gap-3 py-12 text-brine">
      <span aria-hidden="true" className="h-4 w-4 animate-spin rounded-full border-2 border-frost border-t-transparent" />
      Loading your desk…
    </div>
  );
}
