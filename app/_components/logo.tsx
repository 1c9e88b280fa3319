// Benchclear's mark: a spark gap — two sphere terminals with an arc between them — standing on a
// grounded base. Drawn inline (no image request); public/mark.svg is the same drawing for the icon.

type MarkProps = { className?: string; title?: string };

export function Mark({ className = "size-7", title }: MarkProps) {
  return (
    <svg
      viewBox="0 0 32 32"
      className={className}
      role={title ? "img" : undefined}
      aria-hidden={title ? undefined : true}
      aria-label={title}
      focusable="false"
    >
      <rect width="32" height="32" rx="7" fill="#283c60" />
      <path
        d="M12 15.2 14.5 11.4 17.3 16.6 20 12.8"
        fill="none"
        stroke="#e2eaf5"
        strokeWidth="1.8"
        strokeLinecap="round"
        strokeLinejoin="round"
      />
      <circle cx="8.2" cy="14" r="3.4" fill="#f2f6fb" />
      <circle cx="23.8" cy="14" r="3.4" fill="#f2f6fb" />
      <path
        d="M8.2 17.4V23.5M23.8 17.4V23.5M5.5 24h21"
        fill="none"
        stroke="#9db5d9"
        strokeWidth="1.6"
        strokeLinecap="round"
      />
    </svg>
  );
}

/** The mark with the product name as text; the name is the accessible label. */
export function Wordmark({ className = "" }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 ${className}`}>
      <Mark className="size-7 shrink-0" />
      <span className="text-[1.0625rem] font-semibold tracking-tight text-stone-900">Benchclear</span>
    </span>
  );
}
