import type { Metadata } from "next";
import { buttonClasses } from "./_components/button-classes";
import { StatusPage } from "./_components/status-page";

export const metadata: Metadata = { title: "Page not found" };

export default function NotFound() {
  return (
    <StatusPage
      code="404"
      title="Page not found"
      actions={
        <>
          {/* Plain links: this page must load no client code (docs/performance.md). */}
          {/* eslint-disable-next-line @next/next/no-html-link-for-pages -- a full load on purpose: no client code here */}
          <a href="/" className={buttonClasses()}>
            Go to the dashboard
          </a>
          {/* eslint-disable-next-line @next/next/no-html-link-for-pages -- a full load on purpose: no client code here */}
          <a href="/permits" className={buttonClasses({ variant: "secondary" })}>
            Permits
          </a>
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
