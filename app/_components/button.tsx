import Link from "next/link";
import type { ComponentPropsWithRef } from "react";

import { buttonClasses, type ButtonSize, type ButtonVariant } from "./button-classes";

export { buttonClasses, type ButtonSize, type ButtonVariant };

type StyleProps = { variant?: ButtonVariant; size?: ButtonSize };

export type ButtonProps = ComponentPropsWithRef<"button"> & StyleProps;

/** A button; `type` defaults to "button" so it never submits a form by accident. */
export function Button({ variant, size, className, type = "button", ...props }: ButtonProps) {
  return <button type={type} className={buttonClasses({ variant, size, className })} {...props} />;
}

export type ButtonLinkProps = ComponentPropsWithRef<typeof Link> & StyleProps;

/** A link that looks like a button: for navigation, never for actions that change data. */
export function ButtonLink({ variant, size, className, ...props }: ButtonLinkProps) {
  return <Link className={buttonClasses({ variant, size, className })} {...props} />;
}
