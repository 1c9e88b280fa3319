import { TIER_LABELS } from "@/lib/hazard";
import type { Tier } from "@/lib/hazard/types";
import type { MailMessage } from "@/lib/outbox";
import type { EmailContent, EmailFrame } from "./components";

// What an e-mail body may know besides its own data: where the app lives, the institution's name,
// its time zone for dates, and how the recipient relates to the record (for "why you get this").

export type RecipientRelation = "holder" | "operator" | "responsible" | "reviewer" | "officer" | null;

export type EmailContext = EmailFrame & {
  timeZone: string;
  recipient: { address: string; relation: RecipientRelation };
};

export type MailData<K extends MailMessage["kind"]> = Extract<MailMessage, { kind: K }>["data"];

export type EmailBuilder<K extends MailMessage["kind"]> = (data: MailData<K>, ctx: EmailContext) => EmailContent;

/** An absolute link into the app; `path` always starts with "/". */
export function appLink(ctx: Pick<EmailFrame, "appUrl">, path: string): string {
  return new URL(path, ctx.appUrl.endsWith("/") ? ctx.appUrl : `${ctx.appUrl}/`).toString();
}

const DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

/** "12 May 2026" for an ISO calendar day (a permit day: no time zone shift). */
export function formatDay(isoDay: string): string {
  const m = DAY.exec(isoDay);
  if (!m) return isoDay;
  const date = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  return new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "long", year: "numeric", timeZone: "UTC" }).format(
    date,
  );
}

/** "12 May 2026, 14:05 CEST" for an instant, in the institution's time zone. */
export function formatInstant(iso: string, timeZone: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  const options: Intl.DateTimeFormatOptions = {
    day: "numeric",
    month: "long",
    year: "numeric",
    hour: "2-digit",
    minute: "2-digit",
    timeZoneName: "short",
  };
  try {
    return new Intl.DateTimeFormat("en-GB", { ...options, timeZone }).format(date);
  } catch {
    return new Intl.DateTimeFormat("en-GB", { ...options, timeZone: "UTC" }).format(date);
  }
}

/** The "Hazard" fact of an e-mail: the tier glyph and the tier in words. */
export function tierFact(tier: number): { label: string; value: string; tier?: Tier } {
  const known = Number.isInteger(tier) && tier >= 0 && tier <= 4;
  return { label: "Hazard", value: tierWords(tier), ...(known ? { tier: tier as Tier } : {}) };
}

/** "Tier 2 · Reflex injury": a tier is never a bare number (product.md). */
export function tierWords(tier: number): string {
  const label = (TIER_LABELS as Record<number, string | undefined>)[tier];
  return label ? `Tier ${tier} · ${label}` : `Tier ${tier}`;
}
