import type { ReactNode } from "react";
import { AboutFigures } from "@/app/_components/about-figures";
import { Wordmark } from "@/app/_components/logo";

// The frame for signing in and accepting an invitation: no navigation, the note about the figures below.
export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-dvh flex-col bg-stone-50">
      <main id="main" className="mx-auto flex w-full max-w-md flex-1 flex-col justify-center px-4 py-10">
        <div className="mb-6 flex justify-center">
          <Wordmark />
        </div>
        {children}
      </main>
      <footer className="mx-auto w-full max-w-2xl px-4 pb-6">
        <AboutFigures variant="compact" />
      </footer>
    </div>
  );
}
