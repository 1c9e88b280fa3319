import { wayDown, type Assessment, type SetupInput, type TierRules } from "@/lib/hazard";

// "To reach tier N: …": for each criterion that set the tier, the smallest single change that brings
// the set-up down one tier, each found and verified by re-running the engine (lib/hazard/way-down).
// No hooks: renders on the server (apparatus page) and in the form's result step.

export function WayDownList({
  assessment,
  setup,
  rules,
}: {
  assessment: Assessment;
  setup: SetupInput | null;
  rules: TierRules;
}) {
  if (!setup || assessment.tier === 0) return null;
  let result;
  try {
    result = wayDown(setup, rules, assessment);
  } catch {
    return null;
  }
  if (result.suggestions.length === 0) {
    return (
      <p className="text-sm text-stone-700">
        To reach tier {result.toTier}: no single change of one figure brings this set-up down a tier; ask the safety
        officer.
      </p>
    );
  }
  return (
    <section aria-label="The way down a tier" className="rounded-lg border border-stone-200 bg-white p-3 text-sm">
      <p className="font-semibold text-stone-900">To reach tier {result.toTier}:</p>
      <ul className="mt-1 list-disc space-y-1 pl-5 text-stone-800">
        {result.suggestions.map((s) => (
          <li key={s.change.field}>{s.change.text[0].toUpperCase() + s.change.text.slice(1)}.</li>
        ))}
      </ul>
      <p className="mt-1 text-xs text-stone-600">
        Each change alone, checked by assessing the changed set-up. Any one is enough; the rest of the set-up stays as
        it is.
      </p>
    </section>
  );
}
