import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { Alert } from "@/app/_components/alert";
import { Card } from "@/app/_components/card";
import { DataTable, type Column } from "@/app/_components/data-table";
import { institutionTimeZone } from "@/lib/settings/queries";
import { formatDateTime } from "@/app/_components/format";
import { PageHeader } from "@/app/_components/page-header";
import { Stat, StatList } from "@/app/_components/stat";
import { requirePageUser } from "@/lib/auth/guards";
import { inboxEnabled, getCaught, listCaught, type CaughtSummary } from "@/lib/mail/local-inbox";
import { OUTBOX_POLICY } from "@/lib/mail/actions";
import { listOutbox, nextAttemptAt, outboxCounts, type OutboxListRow } from "@/lib/mail/queries";

// /dev/mail — admins only, and only while the local inbox is the configured transport: every
// message the local inbox received, with its HTML part (in a sandboxed frame: no scripts, no same-origin
// access, the page's CSP applies) and its text part, plus outbox rows that wait or failed.

export const metadata: Metadata = { title: "Local inbox" };
export const dynamic = "force-dynamic";

function size(bytes: number): string {
  return bytes < 1024
    ? `${bytes} B`
    : bytes < 1024 * 1024
      ? `${(bytes / 1024).toFixed(1)} KiB`
      : `${(bytes / 1048576).toFixed(2)} MiB`;
}

const messageColumns = (selected: string | undefined, timeZone: string): Column<CaughtSummary>[] => [
  {
    key: "subject",
    header: "Subject",
    rowHeader: true,
    cell: (m) => (
      <Link
        href={`/dev/mail?id=${encodeURIComponent(m.id)}`}
        aria-current={m.id === selected ? "true" : undefined}
        className={`text-ink-800 underline-offset-2 hover:underline ${m.id === selected ? "font-semibold" : ""}`}
      >
        {m.subject || "(no subject)"}
      </Link>
    ),
  },
  { key: "to", header: "To", cell: (m) => m.envelope.to.join(", ") },
  {
    key: "received",
    header: "Received",
    hideBelow: "md",
    cell: (m) => <time dateTime={m.receivedAt}>{formatDateTime(m.receivedAt, timeZone)}</time>,
  },
  {
    key: "notes",
    header: "Notes",
    hideBelow: "lg",
    cell: (m) =>
      [
        m.kind,
        m.attachments.length ? `${m.attachments.length} attachment${m.attachments.length === 1 ? "" : "s"}` : null,
        m.deliveries > 1 ? `same Message-ID delivered ${m.deliveries}×` : null,
      ]
        .filter(Boolean)
        .join(" · "),
  },
];

const outboxColumns = (timeZone: string): Column<OutboxListRow>[] => [
  { key: "id", header: "Row", figure: true, cell: (r) => r.id },
  { key: "status", header: "Status", cell: (r) => (r.status === "failed" ? "Failed" : "Queued") },
  { key: "to", header: "To", cell: (r) => r.toAddress },
  { key: "subject", header: "Subject", hideBelow: "md", cell: (r) => r.subject },
  { key: "attempts", header: "Attempts", figure: true, align: "right", cell: (r) => r.attempts },
  {
    key: "next",
    header: "Next try",
    // The back-off (30 s doubling to 1 h) made visible, so an outage shows as waiting, not lost.
    cell: (r) => {
      const next = nextAttemptAt(r, OUTBOX_POLICY.backoff);
      return next ? formatDateTime(next, timeZone) : "—";
    },
  },
  { key: "error", header: "Last error", hideBelow: "lg", cell: (r) => r.lastError ?? "—" },
];

export default async function DevMailPage({ searchParams }: { searchParams: Promise<{ id?: string | string[] }> }) {
  await requirePageUser("dev.mail", "/dev/mail");
  if (!inboxEnabled()) notFound();
  const { id: rawId } = await searchParams;
  const id = typeof rawId === "string" ? rawId : undefined;
  const [messages, counts, pending, selected, timeZone] = await Promise.all([
    listCaught(),
    outboxCounts(),
    listOutbox({ statuses: ["queued", "failed"], limit: 100 }),
    id ? getCaught(id) : Promise.resolve(null),
    institutionTimeZone(),
  ]);

  return (
    <>
      <PageHeader
        title="Local inbox"
        description="Mail Benchclear sent to the local inbox. Nothing here left this machine. Shown only while MAIL_TRANSPORT=local-inbox."
      />
      <div className="mb-6">
        <StatList>
          <Stat label="Caught" value={messages.length} hint="newest 200 shown" />
          <Stat label="Sent from the outbox" value={counts.sent} />
          <Stat label="Waiting to send" value={counts.queued} />
          <Stat
            label="Failed"
            value={counts.failed}
            hint={counts.failed ? "listed below with the last error" : undefined}
          />
        </StatList>
      </div>

      {id && !selected && (
        <Alert tone="warn" title="Message not found" className="mb-6">
          There is no caught message with that id. It may have been cleared.
        </Alert>
      )}

      {selected && (
        <Card
          className="mb-6"
          title={selected.subject || "(no subject)"}
          description={`To ${selected.envelope.to.join(", ")} · received ${formatDateTime(selected.receivedAt, timeZone)}`}
          actions={<Link href="/dev/mail">Close</Link>}
        >
          <dl className="mb-4 grid grid-cols-[max-content_minmax(0,1fr)] gap-x-4 gap-y-1 text-sm">
            <dt className="text-stone-600">From</dt>
            <dd className="break-all">{selected.from}</dd>
            <dt className="text-stone-600">To</dt>
            <dd className="break-all">{selected.to}</dd>
            <dt className="text-stone-600">Message-ID</dt>
            <dd className="figure break-all">{selected.messageId ?? "—"}</dd>
            <dt className="text-stone-600">Attachments</dt>
            <dd>
              {selected.attachments.length === 0
                ? "none"
                : selected.attachments
                    .map((a) => `${a.filename ?? "(unnamed)"} (${a.contentType}, ${size(a.size)})`)
                    .join(", ")}
            </dd>
          </dl>
          <div className="grid gap-4 xl:grid-cols-2">
            <section aria-labelledby="html-part">
              <h3 id="html-part" className="mb-2 text-sm font-semibold text-stone-900">
                HTML part
              </h3>
              {selected.html ? (
                <iframe
                  title={`HTML part of “${selected.subject}”`}
                  // No permissions at all: scripts, forms, same-origin access and navigation are off.
                  sandbox=""
                  srcDoc={selected.html}
                  referrerPolicy="no-referrer"
                  className="h-[36rem] w-full rounded-md border border-stone-200 bg-white"
                />
              ) : (
                <p className="text-sm text-stone-600">This message has no HTML part.</p>
              )}
            </section>
            <section aria-labelledby="text-part">
              <h3 id="text-part" className="mb-2 text-sm font-semibold text-stone-900">
                Text part
              </h3>
              {/* Focusable so keyboard users can scroll a long message. */}
              <pre
                tabIndex={0}
                aria-labelledby="text-part"
                className="figure h-[36rem] overflow-auto rounded-md border border-stone-200 bg-stone-50 p-3 text-xs leading-5 whitespace-pre-wrap text-stone-800"
              >
                {selected.text || "This message has no text part."}
              </pre>
            </section>
          </div>
        </Card>
      )}

      <div className="flex flex-col gap-6">
        <Card title="Received" flush>
          <DataTable
            caption="Messages the local inbox received, newest first"
            columns={messageColumns(selected?.id, timeZone)}
            rows={messages}
            rowKey={(m) => m.id}
            empty="No mail caught yet. Invite someone or submit an application, and the message appears here within seconds."
          />
        </Card>
        <Card title="Waiting or failed in the outbox" flush>
          <DataTable
            caption="Outbox rows that are queued or failed"
            columns={outboxColumns(timeZone)}
            rows={pending}
            rowKey={(r) => String(r.id)}
            empty="Nothing waiting: every queued message has been sent."
          />
        </Card>
      </div>
    </>
  );
}
