"use client";

import { useFormStatus } from "react-dom";
import { buttonClasses, type ButtonProps } from "./button";

type SubmitButtonProps = Omit<ButtonProps, "type"> & {
  /** Shown while the enclosing form's action runs, e.g. "Signing out…". */
  pendingLabel?: string;
};

/** A submit button that disables itself while its form's server action is pending. */
export function SubmitButton({
  variant,
  size,
  className,
  pendingLabel,
  children,
  disabled,
  ...props
}: SubmitButtonProps) {
  const { pending } = useFormStatus();
  return (
    <button
      type="submit"
      className={buttonClasses({ variant, size, className })}
      disabled={disabled || pending}
      aria-busy={pending || undefined}
      {...props}
    >
      {pending && pendingLabel ? pendingLabel : children}
    </button>
  );
}
