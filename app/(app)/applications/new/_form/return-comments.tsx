"use client";

import { useState } from "react";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import { controlClasses, FieldShell } from "@/app/_components/field";
import { ApiError, apiFetch } from "@/lib/client/api";
import type { FormStep } from "@/lib/applications/schemas";

// The reviewers' return comments on the form of a returned application: each says which step or
// field it is about, as a link to that step, and the applicant can answer it. Once the application
// is submitted again the same comments are shown as history, not as something still to do.

export type ReturnComment = {
  id: string;
  comment: string;
  signerName: string;
  signerRole: string;
  signedAt: string;
  /** "step 2 (Apparatus)", "Spark gap 1 (G1)" */
  pinLabel: string | null;
  pinStep: FormStep | null;
  replies: { id: string; body: string; authorName: string; createdAt: string }[];
};

const timeFormat = new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeStyle: "short" });

type Props = {
  applicationId: string;
  comments: readonly ReturnComment[];
  onGoTo: (step: FormStep) => void;
  /** After resubmitting: the comments are history, read only. */
  history?: boolean;
};

export function ReturnComments({ applicationId, comments, onGoTo, history = false }: Props) {
  const [replies, setReplies] = useState<Record<string, ReturnComment["replies"]>>({});
  if (comments.length === 0) return null;
  const list = (
    <ul className="flex flex-col gap-3">
      {comments.map((c) => (
        <li key={c.id} data-testid="return-comment">
          <p className="whitespace-pre-line">{c.comment}</p>
          <p className="text-xs">
            {c.signerName} ({c.signerRole}), {timeFormat.format(new Date(c.signedAt))}
            {c.pinLabel && (
              <>
                {" · about "}
                {c.pinStep && !history ? (
                  <a
                    href={`/applications/${applicationId}/edit?step=${c.pinStep}`}
                    className="font-medium underline"
                    onClick={(event) => {
                      event.preventDefault();
                      onGoTo(c.pinStep!);
                    }}
                  >
                    {c.pinLabel}
                  </a>
                ) : (
                  c.pinLabel
                )}
              </>
            )}
          </p>
          <Replies
            applicationId={applicationId}
            comment={c}
            added={replies[c.id] ?? []}
            readOnly={history}
            onAdded={(reply) => setReplies((r) => ({ ...r, [c.id]: [...(r[c.id] ?? []), reply] }))}
          />
        </li>
      ))}
    </ul>
  );
  if (history) {
    return (
      <section aria-labelledby="earlier-comments" className="text-sm text-stone-800" data-testid="comment-history">
        <h3 id="earlier-comments" className="font-semibold text-stone-900">
          Earlier comments (answered by this revision)
        </h3>
        <div className="mt-2">{list}</div>
      </section>
    );
  }
  return (
    <Alert tone="warn" title="Returned for changes">
      {list}
    </Alert>
  );
}

function Replies({
  applicationId,
  comment,
  added,
  readOnly,
  onAdded,
}: {
  applicationId: string;
  comment: ReturnComment;
  added: ReturnComment["replies"];
  readOnly: boolean;
  onAdded: (reply: ReturnComment["replies"][number]) => void;
}) {
  const [open, setOpen] = useState(false);
  const [text, setText] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [sending, setSending] = useState(false);
  const all = [...comment.replies, ...added];

  async function send() {
    setSending(true);
    setError(null);
    try {
      const res = await apiFetch<{ reply: { id: string; body: string; createdAt: string } }>(
        `/api/applications/${applicationId}/replies`,
        { body: { decisionId: comment.id, body: text } },
      );
      onAdded({ ...res.reply, authorName: "You" });
      setText("");
      setOpen(false);
    } catch (e) {
      setError(e instanceof ApiError ? (e.issues[0]?.message ?? e.message) : "The reply was not sent.");
    } finally {
      setSending(false);
    }
  }

  return (
    <div className="mt-1">
      {all.length > 0 && (
        <ul className="mt-1 flex flex-col gap-1 border-l-2 border-stone-300 pl-3">
          {all.map((r) => (
            <li key={r.id} data-testid="comment-reply">
              <p className="whitespace-pre-line">{r.body}</p>
              <p className="text-xs">
                Reply by {r.authorName}, {timeFormat.format(new Date(r.createdAt))}
              </p>
            </li>
          ))}
        </ul>
      )}
      {!readOnly &&
        (open ? (
          <div className="mt-2 flex flex-col gap-2">
            <FieldShell label="Your reply to this comment" error={error ?? undefined}>
              {(a11y) => (
                <textarea
                  {...a11y}
                  rows={3}
                  maxLength={2000}
                  value={text}
                  onChange={(e) => setText(e.target.value)}
                  className={controlClasses}
                />
              )}
            </FieldShell>
            <div className="flex gap-2">
              <Button size="sm" onClick={() => void send()} disabled={sending || text.trim() === ""}>
                {sending ? "Sending…" : "Send reply"}
              </Button>
              <Button size="sm" variant="ghost" onClick={() => setOpen(false)}>
                Cancel
              </Button>
            </div>
          </div>
        ) : (
          <Button size="sm" variant="secondary" className="mt-2" onClick={() => setOpen(true)}>
            Reply to this comment
          </Button>
        ))}
    </div>
  );
}
