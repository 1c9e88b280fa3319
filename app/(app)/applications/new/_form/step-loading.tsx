// What stands in for a part of the form while its code downloads (the later steps, the hazard
// engine): a quiet placeholder that says so to everyone, announced politely, no spinner.
export function StepLoading({ what = "this step" }: { what?: string }) {
  return (
    <div role="status" aria-live="polite" aria-busy="true" data-testid="step-loading">
      <p className="text-sm text-stone-700">Loading {what}…</p>
      <div aria-hidden="true" className="mt-3 flex animate-pulse flex-col gap-3">
        <div className="h-4 w-2/3 rounded bg-stone-200" />
        <div className="h-9 rounded bg-stone-200/70" />
        <div className="h-9 rounded bg-stone-200/70" />
      </div>
    </div>
  );
}
