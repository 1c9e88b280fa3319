import { cx } from "./cx";

// The button look, apart from next/link: the root error and not-found pages use it on plain <a> and
// <button> elements, so the pages every visitor can reach load no link-prefetching code.

export type ButtonVariant = "primary" | "secondary" | "danger" | "ghost";
export type ButtonSize = "sm" | "md";

const base =
  "inline-flex items-center justify-center gap-1.5 rounded-md font-medium whitespace-nowrap no-underline " +
  "transition-colors disabled:cursor-not-allowed disabled:opacity-60 aria-disabled:cursor-not-allowed aria-disabled:opacity-60";

const variants: Record<ButtonVariant, string> = {
  primary: "bg-ink-700 text-white shadow-xs hover:bg-ink-800 active:bg-ink-900",
  secondary: "border border-stone-300 bg-white text-stone-800 shadow-xs hover:border-stone-400 hover:bg-stone-50",
  danger: "bg-red-700 text-white shadow-xs hover:bg-red-800 active:bg-red-900",
  ghost: "text-ink-700 hover:bg-ink-50 hover:text-ink-900",
};

const sizes: Record<ButtonSize, string> = {
  sm: "h-8 px-2.5 text-sm",
  md: "h-10 px-3.5 text-sm",
};

export function buttonClasses({
  variant = "primary",
  size = "md",
  className,
}: { variant?: ButtonVariant; size?: ButtonSize; className?: string } = {}): string {
  return cx(base, variants[variant], sizes[size], className);
}
