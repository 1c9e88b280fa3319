import type { Metadata } from "next";
import Link from "next/link";
import { PageHeader } from "@/app/_components/page-header";
import { emptySourceText, emptySetupText } from "@/lib/apparatus/setup-text";
import { requirePageUser } from "@/lib/auth/guards";
import { currentTierRules } from "@/lib/hazard-rules";
import { ApparatusForm } from "../_components/apparatus-form";

export const metadata: Metadata = { title: "Register apparatus" };

export default async function NewApparatusPage() {
  const user = await requirePageUser("apparatus.write", "/apparatus/new");
  const rules = await currentTierRules();
  const setup = { ...emptySetupText(), sources: [emptySourceText("capacitor", "C1")] };
  return (
    <>
      <PageHeader
        eyebrow={<Link href="/apparatus">Apparatus</Link>}
        title="Register apparatus"
        description="Describe the set-up once; applications can then use it, and every later edit is kept as a revision."
      />
      <ApparatusForm
        mode="create"
        rules={rules}
        draftKey={`apparatus.new.${user.id}`}
        initial={{ name: "", room: "", notes: "", setup }}
      />
    </>
  );
}
