import type { Metadata } from "next";
import { isRecordId } from "@/lib/http/ids";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { PageHeader } from "@/app/_components/page-header";
import { listApparatusChoices } from "@/lib/apparatus/queries";
import { pinLabel, pinStep } from "@/lib/applications/pins";
import { getDraftForEdit } from "@/lib/applications/queries";
import { requirePageUser } from "@/lib/auth/guards";
import { currentTierRules } from "@/lib/hazard-rules";
import { AppError } from "@/lib/errors";
import { returnCommentsFor } from "@/lib/review/queries";
import { repliesFor } from "@/lib/review/replies";
import { ApplicationForm } from "../../new/_form/application-form";
import { FormSubtitle } from "../../new/_form/form-subtitle";

export const metadata: Metadata = { title: "Edit application" };

type PageProps = { params: Promise<{ id: string }> };

export default async function EditApplicationPage({ params }: PageProps) {
  const { id } = await params;
  const user = await requirePageUser("application.create", `/applications/${id}/edit`);
  if (!isRecordId(id)) notFound();
  let app;
  try {
    app = await getDraftForEdit(user, id);
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
  // Submitted and decided applications are read, not edited.
  if (!app.editable) redirect(`/applications/${id}`);
  const [rules, choices, comments, replies] = await Promise.all([
    currentTierRules(),
    listApparatusChoices(user),
    returnCommentsFor(user, id),
    repliesFor(user, id),
  ]);
  const returnComments = comments.map((c) => ({
    id: c.id,
    comment: c.comment ?? "",
    signerName: c.signerName,
    signerRole: c.signerRole,
    signedAt: c.signedAt.toISOString(),
    pinLabel: c.pinnedTo ? pinLabel(c.pinnedTo, app.draft) : null,
    pinStep: pinStep(c.pinnedTo),
    replies: replies
      .filter((r) => r.decisionId === c.id)
      .map((r) => ({ id: r.id, body: r.body, authorName: r.authorName, createdAt: r.createdAt.toISOString() })),
  }));
  // A returned application opens on the step its newest pinned comment is about (the address's
  // ?step=, read by the form, still wins: Back, Forward and reloads stay where they were).
  const pinned = [...returnComments].reverse().find((c) => c.pinStep !== null);
  const openingStep = app.state === "returned" && pinned?.pinStep ? pinned.pinStep : app.step;
  return (
    <>
      <PageHeader
        eyebrow={<Link href="/applications">Applications</Link>}
        title={app.draft.event.title || "Untitled application"}
        // Follows the form: once it is submitted, the line says so (it kept saying "draft").
        description={
          <FormSubtitle
            draftText={
              app.state === "returned"
                ? `A-${app.seq}, returned for changes. The draft saves itself as you type.`
                : `A-${app.seq}, draft. It saves itself as you type.`
            }
          />
        }
      />
      <ApplicationForm
        rules={rules}
        choices={choices}
        initial={{
          id: app.id,
          seq: app.seq,
          state: app.state as "draft" | "returned",
          version: app.version,
          step: openingStep,
          draft: app.draft,
          attachments: app.attachments.map(({ createdAt: _createdAt, ...ref }) => ref),
          savedAt: app.updatedAt.toISOString(),
          revisions: app.revisions,
          returnComments,
        }}
      />
    </>
  );
}
