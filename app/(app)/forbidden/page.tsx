import type { Metadata } from "next";
import { ButtonLink } from "@/app/_components/button";
import { PageHeader } from "@/app/_components/page-header";
import { requirePageUser } from "@/lib/auth/guards";

export const metadata: Metadata = { title: "Not allowed" };

export default async function ForbiddenPage() {
  await requirePageUser(undefined, "/");
  return (
    <>
      <PageHeader
        title="Not allowed"
        description="Your roles do not include this page. If you need it, ask your Benchclear admin."
      />
      <ButtonLink href="/" variant="secondary">
        Back to the dashboard
      </ButtonLink>
    </>
  );
}
