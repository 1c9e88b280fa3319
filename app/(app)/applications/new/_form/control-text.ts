import { formatQuantity, type Assessment, type ControlRule } from "@/lib/hazard";

/**
 * A control's words with this set-up's figure in them: "Audience kept outside 1.5 m (limited
 * approach distance)." instead of a distance the reader has to look up on another step.
 */
export function controlText(rule: Pick<ControlRule, "text">, assessment: Assessment | null): string {
  const limited = assessment?.approach.limited_m ?? null;
  if (limited === null) return rule.text;
  return rule.text.replace(
    /the limited approach distance/,
    `${formatQuantity(limited, "m")} (limited approach distance)`,
  );
}
