import type { Metadata } from "next";
import { ButtonLink } from "@/app/_components/button";
import { PageHeader } from "@/app/_components/page-header";
import { can, requireSignedInPage } from "@/lib/auth/guards";

export const metadata: Metadata = { title: "Not allowed" };

export default async function ForbiddenPage() {
  // Every account reaches this page, a responder's too (which has no dashboard to go back to).
  const user = await requireSignedInPage("/");
  const home = can(user, "workspace.use")
    ? { href: "/", label: "Back to the dashboard" }
    : { href: "/live", label: "Open the live sheet" };
  return (
    <>
      <PageHeader
        title="Not allowed"
        description="Your roles do not include this page. If you need it, ask your Benchclear admin."
      />
      <ButtonLink href={home.href} variant="secondary">
        {home.label}
      </ButtonLink>
    </>
  );
}
