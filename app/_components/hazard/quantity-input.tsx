"use client";

import type { ComponentPropsWithRef, ReactNode } from "react";
import { readQuantity } from "@/lib/apparatus/setup-text";
import { BASE_UNIT, formatQuantity, type Dimension } from "@/lib/hazard";
import { cx } from "../cx";
import { controlClasses, FieldShell } from "../field";

// A quantity typed the way it is written on a bench sheet ("4.7 nF", "30 kV", "5 mm", "2 MΩ"): the
// text is kept as typed, and the value it reads as is shown under it while typing, so a slip of
// prefix (mF for nF) is seen before it changes the tier.

type QuantityInputProps = Omit<ComponentPropsWithRef<"input">, "id" | "value" | "children"> & {
  label: ReactNode;
  dimension: Dimension;
  /** The current text (watched from the form), for the "reads as" line. */
  text: string;
  example: string;
  hint?: ReactNode;
  error?: string;
  required?: boolean;
  fieldClassName?: string;
};

export function QuantityInput({
  label,
  dimension,
  text,
  example,
  hint,
  error,
  required,
  fieldClassName,
  className,
  ...input
}: QuantityInputProps) {
  const read = readQuantity(text ?? "", dimension);
  const state = read.empty ? "empty" : read.ok ? "ok" : "error";
  const reading = read.empty
    ? required
      ? `Required, e.g. ${example}.`
      : `Optional, e.g. ${example}.`
    : read.ok
      ? `Reads as ${formatQuantity(read.value, BASE_UNIT[dimension])}`
      : read.message;
  return (
    <FieldShell label={label} hint={hint} error={error} className={fieldClassName}>
      {(a11y) => (
        <>
          <input
            {...input}
            {...a11y}
            aria-describedby={cx(a11y["aria-describedby"], `${a11y.id}-reads`) || undefined}
            type="text"
            inputMode="text"
            autoComplete="off"
            spellCheck={false}
            placeholder={example}
            className={cx(controlClasses, "figure", className)}
          />
          <p
            id={`${a11y.id}-reads`}
            data-reads={state}
            className={cx(
              "figure mt-0.5 text-xs",
              state === "error" ? "text-red-800" : state === "ok" ? "text-stone-700" : "text-stone-500",
            )}
          >
            {reading}
          </p>
        </>
      )}
    </FieldShell>
  );
}
