"use client";

import { forwardRef } from "react";
import type { Assessment, Flag, SetupInput } from "@/lib/hazard";
import { Alert } from "../alert";

// Figures a part of its kind cannot have (a 200 mΩ bleeder on a 40 kV bank, 1 F at 40 kV) usually
// come from a mistyped unit prefix. The engine raises an "implausible" flag naming the field; the
// forms ask the user to confirm each such figure before moving on or saving. The server still
// accepts the figure once confirmed: an unusual part can be real.

/** The engine's implausible-input flags of an assessment (none while the set-up does not read). */
export function implausibleFlags(assessment: Assessment | null): Flag[] {
  return assessment?.flags.filter((f) => f.code === "implausible") ?? [];
}

/** What the confirmation was given for: a changed figure has to be confirmed again. */
export function implausibleKey(flags: readonly Flag[]): string {
  return flags.map((f) => `${f.field ?? ""}|${f.message}`).join("\n");
}

const FIELD_WORDS: Record<string, string> = {
  bleeder_ohm: "bleeder resistance",
  capacitance_F: "capacitance",
  voltage_V: "voltage",
  outputCapacitance_F: "output capacitance",
  currentLimit_A: "current limit",
  seriesResistance_ohm: "series resistance",
  resistance_ohm: "resistance",
  radius_m: "radius",
};

/** "C1's bleeder resistance" for "sources[0].bleeder_ohm", in the words of the form. */
export function fieldInWords(field: string | undefined, setup: SetupInput | null): string {
  if (!field) return "a figure";
  const match = /^(sources|bleeders)\[(\d+)\]\.(\w+)$/.exec(field);
  if (!match) return field;
  const [, list, indexText, key] = match;
  const index = Number(indexText);
  const what = FIELD_WORDS[key] ?? key;
  if (list === "sources") {
    const id = setup?.sources[index]?.id?.trim();
    return `${id || `source ${index + 1}`}'s ${what}`;
  }
  const id = setup?.bleeders?.[index]?.id?.trim();
  return `the ${what} of ${id ? `bleeder ${id}` : `bleeder ${index + 1}`}`;
}

function listWords(words: string[]): string {
  const unique = [...new Set(words)];
  if (unique.length <= 1) return unique.join("");
  return `${unique.slice(0, -1).join(", ")} and ${unique[unique.length - 1]}`;
}

type Props = {
  flags: readonly Flag[];
  setup: SetupInput | null;
  confirmed: boolean;
  onConfirmedChange: (confirmed: boolean) => void;
  /** Set when the user tried to move on without confirming: the box says why it stopped them. */
  asked: boolean;
  /** What confirming lets the user do, e.g. "moving on" or "saving". */
  action: string;
};

/** The figures that look mistyped, and a checkbox naming them that confirms they are meant. */
export const ImplausibleConfirm = forwardRef<HTMLInputElement, Props>(function ImplausibleConfirm(
  { flags, setup, confirmed, onConfirmedChange, asked, action },
  ref,
) {
  if (flags.length === 0) return null;
  const names = listWords(flags.map((f) => fieldInWords(f.field, setup)));
  return (
    <div data-testid="implausible-confirm">
      <Alert tone={asked && !confirmed ? "error" : "warn"} title="Check these figures">
        <ul className="list-disc pl-5">
          {flags.map((f) => (
            <li key={`${f.field}-${f.message}`}>{f.message}</li>
          ))}
        </ul>
        {asked && !confirmed && (
          <p className="mt-1 font-medium" role="alert">
            Correct the {flags.length === 1 ? "figure" : "figures"}, or confirm{" "}
            {flags.length === 1 ? "it is" : "they are"} as intended before {action}.
          </p>
        )}
        <label className="mt-2 flex items-start gap-2 font-medium">
          <input
            ref={ref}
            type="checkbox"
            className="mt-1 size-4"
            checked={confirmed}
            onChange={(e) => onConfirmedChange(e.target.checked)}
          />
          <span>I have checked {names}: not mistyped, as intended.</span>
        </label>
      </Alert>
    </div>
  );
});
