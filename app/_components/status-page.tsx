import type { ReactNode } from "react";
import { Wordmark } from "./logo";

type StatusPageProps = {
  /** A short code or word above the title, e.g. "404". */
  code?: string;
  title: string;
  children?: ReactNode;
  actions?: ReactNode;
};

/** A quiet full-page message for not-found and error screens, outside the signed-in frame. */
export function StatusPage({ code, title, children, actions }: StatusPageProps) {
  return (
    <main id="main" className="flex min-h-dvh items-center justify-center px-4 py-12">
      <div className="w-full max-w-md">
        <Wordmark />
        {code && <p className="figure mt-8 text-sm font-medium tracking-wide text-stone-600">{code}</p>}
        <h1 className="mt-1 text-2xl font-semibold tracking-tight text-stone-900">{title}</h1>
        {children && <div className="mt-2 space-y-2 text-[0.9375rem] text-stone-700">{children}</div>}
        {actions && <div className="mt-6 flex flex-wrap gap-2">{actions}</div>}
      </div>
    </main>
  );
}
