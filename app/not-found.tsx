import type { Metadata } from "next";
import { ButtonLink } from "./_components/button";
import { StatusPage } from "./_components/status-page";

export const metadata: Metadata = { title: "Page not found" };

export default function NotFound() {
  return (
    <StatusPage
      code="404"
      title="Page not found"
      actions={
        <>
          <ButtonLink href="/">Go to the dashboard</ButtonLink>
          <ButtonLink href="/permits" variant="secondary">
            Permits
          </ButtonLink>
        </>
      }
    >
      <p>There is no page at this address. It may have moved, or the link may be incomplete.</p>
      <p className="text-sm text-stone-600">
        Checking a posted permit? Scan its QR code again: the code on the permit opens its status page.
      </p>
    </StatusPage>
  );
}
