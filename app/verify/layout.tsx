import type { ReactNode } from "react";
import { AboutFigures } from "@/app/_components/about-figures";
import { Wordmark } from "@/app/_components/logo";

// The public frame of the permit check that a posted permit's QR code opens: phone first, no
// navigation and no sign-in, the note about the figures below.
export default function VerifyLayout({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-dvh flex-col bg-stone-50">
      <header className="border-b border-stone-200 bg-white">
        <div className="mx-auto flex w-full max-w-md items-center justify-between px-4 py-3">
          <Wordmark />
          <span className="text-sm font-medium text-stone-600">Permit check</span>
        </div>
      </header>
      <main id="main" className="mx-auto w-full max-w-md flex-1 px-4 py-5">
        {children}
      </main>
      <footer className="mx-auto w-full max-w-md px-4 pb-6">
        <AboutFigures variant="compact" />
      </footer>
    </div>
  );
}
