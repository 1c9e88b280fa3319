import path from "node:path";
import type { ReactElement } from "react";

// React's Node renderer (react-dom/server), loaded when the first e-mail is rendered. Next.js
// refuses a static import of react-dom/server in anything it bundles for the server (instrumentation
// included: the in-app worker), because there React renders Server Components; e-mail bodies are
// plain static markup, rendered outside that world. Loading the package at run time through Node's
// own require gives the normal Node build in every process: the web server's worker, the worker
// script and the tests.

type StaticMarkup = (element: ReactElement) => string;

let renderer: StaticMarkup | undefined;

export function renderToStaticMarkup(element: ReactElement): string {
  if (!renderer) {
    if (typeof process.getBuiltinModule !== "function") {
      throw new Error("Rendering e-mail needs Node.js 20.16 or later (process.getBuiltinModule).");
    }
    const { createRequire } = process.getBuiltinModule("node:module");
    const load = createRequire(path.join(/*turbopackIgnore: true*/ process.cwd(), "package.json"));
    renderer = (load("react-dom/server") as { renderToStaticMarkup: StaticMarkup }).renderToStaticMarkup;
  }
  return renderer(element);
}
