import type { Metadata } from "next";
import { isRecordId } from "@/lib/http/ids";
import Link from "next/link";
import { Alert } from "@/app/_components/alert";
import { PageHeader } from "@/app/_components/page-header";
import { getApparatus, listApparatusChoices } from "@/lib/apparatus/queries";
import { setupToText } from "@/lib/apparatus/setup-text";
import { emptyDraft } from "@/lib/applications/draft";
import { requirePageUser } from "@/lib/auth/guards";
import { currentTierRules } from "@/lib/hazard-rules";
import { ApplicationForm } from "./_form/application-form";
import { FormSubtitle } from "./_form/form-subtitle";

export const metadata: Metadata = { title: "New application" };

type PageProps = { searchParams: Promise<Record<string, string | string[] | undefined>> };

// Nothing is stored until the first autosave: opening this page never creates a record.
export default async function NewApplicationPage({ searchParams }: PageProps) {
  const user = await requirePageUser("application.create", "/applications/new");
  const { apparatus: apparatusParam } = await searchParams;
  const header = (
    <PageHeader
      eyebrow={<Link href="/applications">Applications</Link>}
      title="New application"
      description={
        <FormSubtitle draftText="Six steps; the draft saves itself as you type, and you can leave and come back to it." />
      }
    />
  );
  if (!user.departmentId) {
    return (
      <>
        {header}
        <Alert tone="warn" title="No department">
          Your account has no department yet, so an application cannot be routed to a reviewer. Ask an admin to set it.
        </Alert>
      </>
    );
  }

  const [rules, choices] = await Promise.all([currentTierRules(), listApparatusChoices(user)]);
  const draft = emptyDraft();
  draft.event.responsible = { userId: user.id, name: user.name, trained: false };
  if (isRecordId(apparatusParam)) {
    // Started from a registry record ("Use in an application"): its current revision, as typed text.
    const record = await getApparatus(user, apparatusParam).catch(() => null);
    if (record) {
      draft.apparatus = {
        apparatusId: record.id,
        apparatusRevisionId: record.current.id,
        name: record.current.name,
        room: record.current.room,
        notes: record.current.notes,
        setup: setupToText(record.current.setup),
      };
      draft.event.room = record.current.room;
    }
  }
  return (
    <>
      {header}
      <ApplicationForm
        rules={rules}
        choices={choices}
        initial={{
          id: null,
          seq: null,
          state: "draft",
          version: 1,
          step: 1,
          draft,
          attachments: [],
          savedAt: null,
          revisions: 0,
        }}
      />
    </>
  );
}
