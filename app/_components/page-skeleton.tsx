// A quiet placeholder while a page's data loads: static shapes, no spinner. Use it from a
// route's loading.tsx (`export default function Loading() { return <PageSkeleton />; }`) where the
// page does not redirect: inside a loading boundary a redirect is no longer an HTTP redirect.
export function PageSkeleton() {
  return (
    <div role="status" aria-live="polite" aria-busy="true">
      <span className="sr-only">Loading…</span>
      <div aria-hidden="true" className="animate-pulse">
        <div className="h-7 w-48 rounded bg-stone-200" />
        <div className="mt-2 h-4 w-80 max-w-full rounded bg-stone-200/70" />
        <div className="mt-6 grid gap-6 lg:grid-cols-3">
          <div className="h-56 rounded-lg border border-stone-200 bg-white lg:col-span-2" />
          <div className="h-56 rounded-lg border border-stone-200 bg-white" />
        </div>
      </div>
    </div>
  );
}
