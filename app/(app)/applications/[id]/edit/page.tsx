import type { Metadata } from "next";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { PageHeader } from "@/app/_components/page-header";
import { listApparatusChoices } from "@/lib/apparatus/queries";
import { getDraftForEdit } from "@/lib/applications/queries";
import { requirePageUser } from "@/lib/auth/guards";
import { currentTierRules } from "@/lib/hazard-rules";
import { AppError } from "@/lib/http/errors";
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
  const [rules, choices] = await Promise.all([currentTierRules(), listApparatusChoices(user)]);
  return (
    <>
      <PageHeader
        eyebrow={<Link href="/applications">Applications</Link>}
        title={app.draft.event.title || "Untitled application"}
        description={`A-${app.seq} · ${app.state === "returned" ? "returned for changes" : "draft"}. The draft saves itself as you type.`}
      />
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
