import type { Metadata } from "next";
import { headers } from "next/headers";
import type { ReactNode } from "react";
import { cx } from "@/app/_components/cx";
import { TierBadge } from "@/app/_components/tier-badge";
import { printDay, printDays } from "@/lib/pdf/content";
import { lookUpVerification, type PublicPermit } from "@/lib/verify";

// /verify/[code]: what a posted permit's QR code opens. Public and phone first. It shows the live
// status in large words and colour, then only what the printed permit shows: number, holder,
// apparatus, room, event days, audience, validity, tier, and the signers with what they signed.
// Unknown and malformed codes get the same answer. Every request reads the database, so a revocation
// shows at once; proxy.ts reads it and answers with this page's HTML as already rendered for exactly
// that content, rendering it again whenever anything it shows differs (lib/verify/rendered.ts).

export const dynamic = "force-dynamic";

export const metadata: Metadata = {
  title: "Permit check",
  robots: { index: false, follow: false, nocache: true, googleBot: { index: false, follow: false } },
  referrer: "no-referrer",
};

type Status = PublicPermit["status"] | "unknown";

const STATUS: Record<Status, { word: string; line: string; box: string; icon: ReactNode }> = {
  active: {
    word: "Active",
    line: "This permit is in force: the set-up may be run as the permit describes.",
    box: "bg-emerald-700 text-white",
    icon: <path d="M6 12.5 10 16.5 18 8" />,
  },
  expired: {
    word: "Expired",
    line: "The permit’s last valid day has passed. Do not run this set-up.",
    box: "bg-orange-800 text-white",
    icon: (
      <>
        <circle cx="12" cy="12" r="8" />
        <path d="M12 7.5V12l3 2" />
      </>
    ),
  },
  revoked: {
    word: "Revoked",
    line: "This permit was withdrawn. Do not run this set-up.",
    box: "bg-red-700 text-white",
    icon: <path d="M7 7l10 10M17 7 7 17" />,
  },
  unknown: {
    word: "Unknown",
    line: "No permit matches this code. Treat the set-up as not permitted until your safety office confirms it.",
    box: "bg-stone-700 text-white",
    icon: (
      <>
        <path d="M9.5 9.5a2.5 2.5 0 1 1 3.5 2.3c-.6.3-1 .9-1 1.6v.6" />
        <circle cx="12" cy="17" r="0.6" />
      </>
    ),
  },
};

function StatusBanner({ status, children }: { status: Status; children?: ReactNode }) {
  const look = STATUS[status];
  return (
    <section aria-labelledby="permit-status" className={cx("rounded-xl px-5 py-5 shadow-sm", look.box)}>
      <p className="text-sm font-medium tracking-wide uppercase opacity-90">Permit status</p>
      <div className="mt-1 flex items-center gap-3">
        <svg
          viewBox="0 0 24 24"
          aria-hidden="true"
          focusable="false"
          className="size-10 shrink-0"
          fill="none"
          stroke="currentColor"
          strokeWidth="2.4"
          strokeLinecap="round"
          strokeLinejoin="round"
        >
          {look.icon}
        </svg>
        <h1 id="permit-status" className="text-5xl leading-none font-bold tracking-tight">
          {look.word}
        </h1>
      </div>
      <p className="mt-3 text-base leading-6">{look.line}</p>
      {children}
    </section>
  );
}

function Row({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="flex flex-col gap-0.5 border-b border-stone-200 py-3 last:border-b-0">
      <dt className="text-sm text-stone-600">{label}</dt>
      <dd className="text-lg font-medium text-stone-900">{children}</dd>
    </div>
  );
}

function Found({ permit }: { permit: PublicPermit }) {
  const notYet = permit.status === "active" && permit.today < permit.validFrom;
  return (
    <>
      <StatusBanner status={permit.status}>
        {notYet && (
          <p className="mt-1 text-base font-semibold">It starts on {printDay(permit.validFrom)}: not before.</p>
        )}
        {permit.status === "revoked" && permit.revokedOn && (
          <p className="mt-1 text-base font-semibold">Revoked on {printDay(permit.revokedOn)}.</p>
        )}
      </StatusBanner>
      <dl className="mt-5 rounded-xl border border-stone-200 bg-white px-4">
        <Row label="Permit number">
          <span className="figure text-xl">{permit.number}</span>
        </Row>
        <Row label="Holder">{permit.holderName}</Row>
        <Row label="Apparatus">{permit.apparatusName || "—"}</Row>
        <Row label="Room">{permit.room || "—"}</Row>
        <Row label="Event days">{printDays(permit.eventFirstDay, permit.eventLastDay)}</Row>
        <Row label="Audience">{permit.audience}</Row>
        <Row label="Valid">
          {printDay(permit.validFrom)} – {printDay(permit.validTo)}
        </Row>
        <Row label="Tier">
          <TierBadge tier={permit.tier} />
        </Row>
      </dl>
      <section aria-labelledby="signers" className="mt-5 rounded-xl border border-stone-200 bg-white px-4 py-3">
        <h2 id="signers" className="text-sm font-semibold text-stone-900">
          Signed by
        </h2>
        {permit.signers.length === 0 ? (
          <p className="mt-1 text-base text-stone-700">No review signatures: the holder recorded this set-up.</p>
        ) : (
          <ul className="mt-1 divide-y divide-stone-200">
            {permit.signers.map((signer, i) => (
              <li key={`${signer.name}-${i}`} className="py-2">
                <p className="text-base font-medium text-stone-900">{signer.name}</p>
                <p className="text-sm text-stone-700">{signer.meaning}</p>
              </li>
            ))}
          </ul>
        )}
      </section>
      {permit.signaturesCheckOut ? (
        <p className="mt-4 rounded-xl border border-emerald-700/30 bg-emerald-50 px-4 py-3 text-base text-stone-900">
          <span className="font-semibold">The signatures check out.</span> Each one was re-checked against the signed
          content and this permit&rsquo;s dates and conditions when you opened this page.
        </p>
      ) : (
        <p
          role="alert"
          className="mt-4 rounded-xl border-2 border-red-700 bg-red-50 px-4 py-3 text-base text-stone-900"
        >
          <span className="font-semibold">The signatures do not check out.</span> The record of this permit does not
          match what was signed. Do not rely on it: do not run this set-up, and tell your safety office.
        </p>
      )}
      <p className="mt-4 text-sm text-stone-600">
        Status on {printDay(permit.today)}, read from the permit register when you opened this page.
      </p>
    </>
  );
}

export default async function VerifyPage({ params }: { params: Promise<{ code: string }> }) {
  const { code } = await params;
  const outcome = await lookUpVerification({ code, headers: await headers() });

  if (outcome.kind === "limited") {
    const minutes = Math.max(1, Math.ceil(outcome.retryAfterSeconds / 60));
    return (
      <section aria-labelledby="limited" className="rounded-xl border border-stone-300 bg-white px-5 py-5">
        <p className="text-sm font-medium tracking-wide text-stone-600 uppercase">Permit status</p>
        <h1 id="limited" className="mt-1 text-3xl font-bold tracking-tight text-stone-900">
          Too many checks
        </h1>
        <p className="mt-3 text-base text-stone-700">
          This network has checked many permits in a short time. Wait about {minutes}{" "}
          {minutes === 1 ? "minute" : "minutes"} and scan the code again.
        </p>
      </section>
    );
  }
  if (outcome.kind === "unknown") {
    return (
      <>
        <StatusBanner status="unknown" />
        <p className="mt-4 text-base text-stone-700">
          Scan the QR code on the posted permit itself: a copied, shortened or mistyped link does not match.
        </p>
      </>
    );
  }
  return <Found permit={outcome.permit} />;
}
