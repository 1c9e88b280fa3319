import { controlClasses } from "./field";
import { TIER_LABELS, TIERS, type Tier } from "./tier";

type TierFilterProps = {
  /** The tier filtered on, or none for "Any tier". */
  value: Tier | number | null | undefined;
  id?: string;
  /** Show each tier's label after its number ("Tier 2 · …"). */
  named?: boolean;
};

/** The tier `<select name="tier">` of the list filters (apparatus, permits, review queue); the page labels it. */
export function TierFilter({ value, id, named = false }: TierFilterProps) {
  return (
    <select id={id} name="tier" defaultValue={value ?? ""} className={`${controlClasses} mt-1`}>
      <option value="">Any tier</option>
      {TIERS.map((t) => (
        <option key={t} value={t}>
          Tier {t}
          {named ? ` · ${TIER_LABELS[t]}` : ""}
        </option>
      ))}
    </select>
  );
}
