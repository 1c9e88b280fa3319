import { cx } from "./cx";

// Application states and permit statuses in words. Outlined (tier badges are filled) so the two
// never read as one another.

export const APPLICATION_STATE_LABELS = {
  draft: "Draft",
  submitted: "Submitted",
  in_review: "In review",
  returned: "Returned",
  approved: "Approved",
  withdrawn: "Withdrawn",
  rejected: "Rejected",
} as const;
export type ApplicationState = keyof typeof APPLICATION_STATE_LABELS;

export const PERMIT_STATUS_LABELS = {
  active: "Active",
  expired: "Expired",
  revoked: "Revoked",
} as const;
export type PermitStatus = keyof typeof PERMIT_STATUS_LABELS;

type Look = "neutral" | "progress" | "attention" | "good" | "ended";

const LOOK: Record<ApplicationState | PermitStatus, Look> = {
  draft: "neutral",
  submitted: "progress",
  in_review: "progress",
  returned: "attention",
  approved: "good",
  withdrawn: "ended",
  rejected: "ended",
  active: "good",
  expired: "ended",
  revoked: "ended",
};

const LOOK_CLASSES: Record<Look, { box: string; dot: string }> = {
  neutral: { box: "border-stone-300 text-stone-700", dot: "border border-stone-500" },
  progress: { box: "border-ink-300 text-ink-800", dot: "bg-ink-600" },
  attention: { box: "border-orange-300 text-orange-900", dot: "bg-orange-600" },
  good: { box: "border-emerald-300 text-emerald-900", dot: "bg-emerald-600" },
  ended: { box: "border-stone-300 text-stone-600", dot: "bg-stone-400" },
};

type StateBadgeProps =
  | { kind: "application"; state: ApplicationState; className?: string }
  | { kind: "permit"; state: PermitStatus; className?: string };

export function StateBadge(props: StateBadgeProps) {
  const label =
    props.kind === "application" ? APPLICATION_STATE_LABELS[props.state] : PERMIT_STATUS_LABELS[props.state];
  const look = LOOK_CLASSES[LOOK[props.state]];
  return (
    <span
      className={cx(
        "inline-flex items-center gap-1.5 rounded-full border bg-white px-2 py-px text-xs leading-5 font-medium whitespace-nowrap",
        look.box,
        props.className,
      )}
    >
      <span aria-hidden="true" className={cx("size-1.5 rounded-full", look.dot)} />
      {label}
    </span>
  );
}
