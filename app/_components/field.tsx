import { useId, type ComponentPropsWithRef, type ReactNode } from "react";
import { cx } from "./cx";

type FieldA11y = {
  id: string;
  "aria-describedby"?: string;
  "aria-invalid"?: true;
};

type FieldShellProps = {
  label: ReactNode;
  /** Defaults to a generated id. */
  id?: string;
  hint?: ReactNode;
  /** One message or several (zod's fieldErrors give an array). */
  error?: string | readonly string[];
  required?: boolean;
  className?: string;
  /** Renders the control with the id and aria attributes it must carry. */
  children: (a11y: FieldA11y) => ReactNode;
};

export const controlClasses =
  "block w-full rounded-md border bg-white px-3 py-2 text-[0.9375rem] text-stone-900 shadow-xs " +
  "placeholder:text-stone-500 disabled:bg-stone-100 disabled:text-stone-500 " +
  "border-stone-300 hover:border-stone-400 aria-invalid:border-red-700 aria-invalid:hover:border-red-800 " +
  "focus-visible:border-ink-600";

/**
 * Label, control, hint and error for any control (select, textarea, a custom input). The error
 * region is always in the page and aria-live, so a message that appears after a submit is read out.
 */
export function FieldShell({ label, id, hint, error, required, className, children }: FieldShellProps) {
  const generated = useId();
  const controlId = id ?? generated;
  const hintId = `${controlId}-hint`;
  const errorId = `${controlId}-error`;
  const messages = error === undefined ? [] : typeof error === "string" ? [error] : error;
  const invalid = messages.length > 0;
  const describedBy = [hint ? hintId : null, invalid ? errorId : null].filter(Boolean).join(" ") || undefined;

  return (
    <div className={cx("flex flex-col", className)}>
      <label htmlFor={controlId} className="text-sm font-medium text-stone-800">
        {label}
        {required && <span className="ml-1 font-normal text-stone-500">(required)</span>}
      </label>
      {hint && (
        <p id={hintId} className="mt-0.5 text-xs leading-5 text-stone-600">
          {hint}
        </p>
      )}
      <div className="mt-1">
        {children({ id: controlId, "aria-describedby": describedBy, "aria-invalid": invalid ? true : undefined })}
      </div>
      <div id={errorId} aria-live="polite" className="text-sm text-red-800">
        {messages.map((m) => (
          <p key={m} className="mt-1 flex gap-1.5">
            <span aria-hidden="true" className="font-semibold">
              !
            </span>
            {m}
          </p>
        ))}
      </div>
    </div>
  );
}

type FieldProps = Omit<ComponentPropsWithRef<"input">, "id" | "children"> & {
  label: ReactNode;
  name: string;
  id?: string;
  hint?: ReactNode;
  error?: string | readonly string[];
  /** Set monospace digits for figure inputs ("4.7 nF", "25 kV"). */
  figure?: boolean;
  fieldClassName?: string;
};

/** A text-like input with its label, hint and error. Spreads the rest onto <input> (works with register()). */
export function Field({ label, id, hint, error, figure, fieldClassName, className, required, ...input }: FieldProps) {
  return (
    <FieldShell label={label} id={id} hint={hint} error={error} required={required} className={fieldClassName}>
      {(a11y) => (
        <input {...input} {...a11y} required={required} className={cx(controlClasses, figure && "figure", className)} />
      )}
    </FieldShell>
  );
}
