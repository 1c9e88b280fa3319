import type { Metadata } from "next";
import { isRecordId } from "@/lib/http/ids";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { PageHeader } from "@/app/_components/page-header";
import { getApparatus } from "@/lib/apparatus/queries";
import { setupToText } from "@/lib/apparatus/setup-text";
import { requirePageUser } from "@/lib/auth/guards";
import { currentTierRules } from "@/lib/hazard-rules";
import { AppError } from "@/lib/errors";
import { ApparatusForm } from "../../_components/apparatus-form";

export const metadata: Metadata = { title: "Edit apparatus" };

type PageProps = { params: Promise<{ id: string }> };

export default async function EditApparatusPage({ params }: PageProps) {
  const { id } = await params;
  const user = await requirePageUser("apparatus.write", `/apparatus/${id}/edit`);
  if (!isRecordId(id)) notFound();
  let apparatus;
  try {
    apparatus = await getApparatus(user, id);
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
  if (!apparatus.canEdit) redirect("/forbidden");
  const rules = await currentTierRules();
  return (
    <>
      <PageHeader
        eyebrow={<Link href={`/apparatus/${apparatus.id}`}>{apparatus.name}</Link>}
        title="Edit apparatus"
        description={`Saving keeps revision ${apparatus.currentRevision} as it was and adds revision ${apparatus.currentRevision + 1}.`}
      />
      <ApparatusForm
        mode="edit"
        apparatusId={apparatus.id}
        revision={apparatus.currentRevision}
        rules={rules}
        draftKey={`apparatus.${apparatus.id}.${user.id}`}
        initial={{
          name: apparatus.current.name,
          room: apparatus.current.room,
          notes: apparatus.current.notes,
          setup: setupToText(apparatus.current.setup),
        }}
      />
    </>
  );
}
