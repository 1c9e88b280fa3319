// assessSetup: from a described set-up to its figures, tier, reasons and flags (hazard-model.md).
// Pure and deterministic: the same input and rules give the same assessment, in the browser and on
// the server, so a stored snapshot can always be recomputed and compared. The work is in
// prepare.ts (per-source figures), findings.ts (tier criteria) and flags.ts (flags beside the tier).

import { approachDistances, type ApproachLookup } from "./approach";
import { findings, highestTier, idList, maxOf, strongestPerCriterion, sum } from "./findings";
import { flagsFor } from "./flags";
import { prepareAll } from "./prepare";
import { completeRules, DEFAULT_RULES, TIER_LABELS, validateRules } from "./rules";
import type { Assessment, Reason, SetupInput, SourceResult, Tier, TierRules } from "./types";
import { formatQuantity as q } from "./units";
import { checkSetupInput, sourceId } from "./validate";

/**
 * Version of the calculation itself; stored with every assessment beside the rules' version.
 * 2.0.0: gaps cap only the sources they are across, at the breakdown's upper bound; every published
 * sphere-gap row, monotone interpolation; approach distances null beyond the tables; τ and ∫i²dt from
 * capacitive sources; bleeders across sources; AC arc-flash, DC thermal, 5 s discharge, ∫i²dt criteria.
 * 2.0.1: a set-up with DC and AC parts where one voltage lies beyond its approach table gets no
 * distance (null), not the other table's smaller one.
 */
export const ENGINE_VERSION = "2.0.1";

function approachReason(lookup: ApproachLookup, system: "dc" | "ac", voltage_V: number, tier: Tier): Reason | null {
  if (lookup.rowUpTo_V === null) return null;
  return {
    criterion: `approach-distance-${system}`,
    value: voltage_V,
    unit: "V",
    threshold: lookup.rowUpTo_V,
    tier,
    meaning: lookup.note,
    source: lookup.source,
    ref: lookup.ref,
  };
}

const maxOrNull = (a: number | null, b: number | null) => (a === null ? b : b === null ? a : Math.max(a, b));

/**
 * Assesses a set-up against the tier rules (the defaults of hazard-model.md unless an institution's
 * stricter set is given). Throws HazardInputError, naming the field, for input it cannot assess.
 */
export function assessSetup(input: SetupInput, givenRules: TierRules = DEFAULT_RULES): Assessment {
  if (givenRules !== DEFAULT_RULES) validateRules(givenRules);
  const rules = completeRules(givenRules);
  const checked = checkSetupInput(input);
  const gapResults = checked.gaps;
  const ids = input.sources.map((source, index) => sourceId(source, index));
  const body_ohm = input.bodyResistance_ohm ?? rules.bodyResistance.value;

  const items = prepareAll(input, ids, gapResults, checked.gapAcross, checked.bleederAcross, body_ohm, rules);
  const all = findings(items, rules);
  const tierReasons = strongestPerCriterion(all);
  const tier = highestTier(tierReasons);

  let worst = items[0];
  for (const item of items) if (item.peakCurrent_A > worst.peakCurrent_A) worst = item;
  // τ and ∫i²dt: a supply has no stored-energy discharge, so only capacitive sources count.
  const capacitive = items.filter((item) => item.capacitance_F > 0);
  const timeConstant_s = maxOf(capacitive, (item) => item.timeConstant_s);
  const specificEnergy_A2s = maxOf(capacitive, (item) => item.specificEnergy_A2s);

  const maxVoltage_V = maxOf(items, (item) => item.voltage_V);
  const energy_J = sum(items, (item) => item.energy_J);
  const timeToSafe_s = items.some((item) => item.timeToSafe_s === null)
    ? null
    : Math.max(0, ...items.map((item) => item.timeToSafe_s as number));

  const dcItems = items.filter((item) => item.system === "dc");
  const acItems = items.filter((item) => item.system === "ac");
  const dcVoltage = maxOf(dcItems, (item) => item.voltage_V);
  const acVoltage = maxOf(acItems, (item) => item.voltageRms_V);
  const dcLookup = dcItems.length > 0 ? approachDistances(dcVoltage, "dc") : null;
  const acLookup = acItems.length > 0 ? approachDistances(acVoltage, "ac") : null;

  const reasons: Reason[] = tierReasons.map((finding) => ({
    criterion: finding.criterion,
    value: finding.value,
    unit: finding.unit,
    threshold: finding.threshold,
    tier: finding.tier,
    meaning: finding.meaning(),
    source: finding.source,
    ...(finding.ref ? { ref: finding.ref } : {}),
  }));

  // The ceiling of the set-up: the lowest bound any gap puts on a source it is across.
  const cappedItems = items.filter((item) => item.ceiling_V !== null);
  let ceiling_V: number | null = null;
  let ceilingGap: number | null = null;
  for (const item of cappedItems) {
    if (ceiling_V === null || (item.ceiling_V as number) < ceiling_V) {
      ceiling_V = item.ceiling_V;
      ceilingGap = item.ceilingGap;
    }
  }
  gapResults.forEach((gap, gapIndex) => {
    const across = checked.gapAcross[gapIndex].map((i) => items[i]);
    const name = input.gaps?.[gapIndex]?.id ?? `gap ${gapIndex + 1}`;
    const effects: string[] = [];
    if (across.length === 0) {
      effects.push(
        `It is connected across no source, so it caps nothing (a gap elsewhere in the room does not limit an unrelated bank).`,
      );
    } else {
      const own = across.filter((item) => item.ceilingGap === gapIndex);
      const charged = own.filter((item) => item.voltageFromGap);
      const capped = own.filter((item) => !item.voltageFromGap && item.requested_V > gap.bound_V);
      if (charged.length > 0) {
        effects.push(
          `${idList(charged)}, given no voltage, ${charged.length === 1 ? "charges" : "charge"} up to ${q(gap.bound_V, "V")}.`,
        );
      }
      if (capped.length > 0) {
        effects.push(`${idList(capped)} ${capped.length === 1 ? "is" : "are"} held to ${q(gap.bound_V, "V")} peak.`);
      }
      const higher = across.filter((item) => item.ceilingGap !== gapIndex);
      if (higher.length > 0) effects.push(`Another gap across ${idList(higher)} sparks over lower.`);
      if (charged.length + capped.length === 0 && higher.length < across.length) {
        effects.push(`No source it is across (${idList(across)}) is set above it, so it caps nothing.`);
      }
    }
    reasons.push({
      criterion: "gap-ceiling",
      value: across.length > 0 ? maxOf(across, (item) => item.requested_V) : 0,
      unit: "V",
      threshold: gap.bound_V,
      tier,
      meaning: `${name[0].toUpperCase()}${name.slice(1)}: ${gap.detail}. ${effects.join(" ")}`,
      source: gap.source,
      ref: gap.method === "sphere-gap table" ? "aiee-sphere-gap" : "uniform-field-law",
    });
  });
  void ceilingGap;
  for (const [lookup, system, voltage] of [
    [dcLookup, "dc", dcVoltage],
    [acLookup, "ac", acVoltage],
  ] as const) {
    const reason = lookup && approachReason(lookup, system, voltage, tier);
    if (reason) reasons.push(reason);
  }

  const perSource: SourceResult[] = items.map((item) => ({
    id: item.id,
    kind: item.kind,
    voltage_V: item.voltage_V,
    capacitance_F: item.capacitance_F,
    charge_C: item.charge_C,
    energy_J: item.energy_J,
    peakCurrent_A: item.peakCurrent_A,
    timeConstant_s: item.timeConstant_s,
    continuousCurrent_A: item.continuousCurrent_A,
    tier: highestTier(findings([item], rules)),
  }));

  return {
    engineVersion: ENGINE_VERSION,
    rulesVersion: rules.rulesVersion,
    tier,
    tierLabel: TIER_LABELS[tier],
    maxVoltage_V,
    gapCeiling_V: ceiling_V,
    capacitance_F: sum(items, (item) => item.capacitance_F),
    charge_C: sum(items, (item) => item.charge_C),
    energy_J,
    peakCurrent_A: worst.peakCurrent_A,
    timeConstant_s,
    specificEnergy_A2s,
    continuousCurrent_A: maxOf(items, (item) => item.continuousCurrent_A),
    timeToSafe_s,
    // Beyond either table no published distance applies to the set-up, whatever the other table says.
    approach:
      dcLookup?.beyondTable || acLookup?.beyondTable
        ? { limited_m: null, restricted_m: null }
        : {
            limited_m: maxOrNull(dcLookup?.limited_m ?? null, acLookup?.limited_m ?? null),
            restricted_m: maxOrNull(dcLookup?.restricted_m ?? null, acLookup?.restricted_m ?? null),
          },
    reasons,
    flags: flagsFor(input, items, { energy_J, maxVoltage_V }, rules),
    perSource,
  };
}
