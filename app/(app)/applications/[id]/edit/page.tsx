import type { Metadata } from "next";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { Alert } from "@/app/_components/alert";
import { formatDateTime } from "@/app/_components/format";
import { PageHeader } from "@/app/_components/page-header";
import { listApparatusChoices } from "@/lib/apparatus/queries";
import { getDraftForEdit } from "@/lib/applications/queries";
import { requirePageUser } from "@/lib/auth/guards";
import { currentTierRules } from "@/lib/hazard-rules";
import { AppError } from "@/lib/http/errors";
import { returnCommentsFor } from "@/lib/review/queries";
import { ApplicationForm } from "../../new/_form/application-form";

export const metadata: Metadata = { title: "Edit application" };

type PageProps = { params: Promise<{ id: string }> };

export default async function EditApplicationPage({ params }: PageProps) {
  const { id } = await params;
  const user = await requirePageUser("application.create", `/applications/${id}/edit`);
  if (!/^[0-9a-f-]{36}$/i.test(id)) notFound();
  let app;
  try {
    app = await getDraftForEdit(user, id);
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
  // Submitted and decided applications are read, not edited.
  if (!app.editable) redirect(`/applications/${id}`);
  const [rules, choices, comments] = await Promise.all([
    currentTierRules(),
    listApparatusChoices(user),
    returnCommentsFor(user, id),
  ]);
  return (
    <>
      <PageHeader
        eyebrow={<Link href="/applications">Applications</Link>}
        title={app.draft.event.title || "Untitled application"}
        description={`A-${app.seq} · ${app.state === "returned" ? "returned for changes" : "draft"}. The draft saves itself as you type.`}
      />
      {comments.length > 0 && (
        <Alert tone="warn" title="Returned for changes" className="mb-6">
          <ul className="flex flex-col gap-2">
            {comments.map((c) => (
              <li key={c.signedAt.toISOString()}>
                <p>{c.comment}</p>
                <p className="text-xs">
                  {c.signerName} ({c.signerRole}), {formatDateTime(c.signedAt)}
                  {c.pinnedTo
                    ? ` · about ${c.pinnedTo.startsWith("step:") ? `step ${c.pinnedTo.slice(5)}` : c.pinnedTo}`
                    : ""}
                </p>
              </li>
            ))}
          </ul>
        </Alert>
      )}
      <ApplicationForm
        rules={rules}
        choices={choices}
        initial={{
          id: app.id,
          seq: app.seq,
          state: app.state as "draft" | "returned",
          version: app.version,
          step: app.step,
          draft: app.draft,
          attachments: app.attachments.map(({ createdAt: _createdAt, ...ref }) => ref),
          savedAt: app.updatedAt.toISOString(),
          revisions: app.revisions,
        }}
      />
    </>
  );
}
