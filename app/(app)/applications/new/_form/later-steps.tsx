"use client";

import dynamic from "next/dynamic";
import { useState, type ComponentType } from "react";
import { StepLoading } from "./step-loading";

// Steps 2 to 6, the returned-application comments and the confirmation after submitting: code the
// form needs only later, fetched with import() when first shown, or earlier by preloadLaterSteps()
// (on the first edit, so the next step is usually there before it is asked for). Rendered on the
// server like the rest of the form when the page opens at a later step: next/dynamic does that and
// preloads what it rendered (each import() is written out inside its dynamic() call, where Next.js
// finds it). A part already downloaded is rendered at once, in the same render as the step's
// heading, with no loading placeholder in between.

function part<M, P extends object>(
  load: () => Promise<M>,
  pick: (module: M) => ComponentType<P>,
  Dynamic: ComponentType<P>,
) {
  let ready: ComponentType<P> | null = null;
  const preload = () =>
    load().then((module) => {
      ready = pick(module);
    });
  function Part(props: P) {
    // Chosen once per mount: switching from the dynamic wrapper to the component itself later
    // would mount the step again and lose what has focus.
    const [Component] = useState<ComponentType<P>>(() => ready ?? Dynamic);
    return <Component {...props} />;
  }
  return Object.assign(Part, { preload });
}

const loading = () => <StepLoading />;

export const ApparatusStep = part(
  () => import("./apparatus-step"),
  (m) => m.ApparatusStep,
  dynamic(() => import("./apparatus-step").then((m) => m.ApparatusStep), { loading }),
);
export const ResultStep = part(
  () => import("./result-step"),
  (m) => m.ResultStep,
  dynamic(() => import("./result-step").then((m) => m.ResultStep), { loading }),
);
export const ControlsStep = part(
  () => import("./controls-step"),
  (m) => m.ControlsStep,
  dynamic(() => import("./controls-step").then((m) => m.ControlsStep), { loading }),
);
export const AttachmentsStep = part(
  () => import("./attachments-step"),
  (m) => m.AttachmentsStep,
  dynamic(() => import("./attachments-step").then((m) => m.AttachmentsStep), { loading }),
);
export const ReviewStep = part(
  () => import("./review-step"),
  (m) => m.ReviewStep,
  dynamic(() => import("./review-step").then((m) => m.ReviewStep), { loading }),
);
export const ReturnComments = part(
  () => import("./return-comments"),
  (m) => m.ReturnComments,
  dynamic(() => import("./return-comments").then((m) => m.ReturnComments), {
    loading: () => <StepLoading what="the reviewers' comments" />,
  }),
);
export const SubmittedCard = part(
  () => import("./submitted-card"),
  (m) => m.SubmittedCard,
  dynamic(() => import("./submitted-card").then((m) => m.SubmittedCard), {
    loading: () => <StepLoading what="the confirmation" />,
  }),
);

let preloaded = false;

/** Starts downloading every later part (once per page; again after a failure). */
export function preloadLaterSteps(): void {
  if (preloaded) return;
  preloaded = true;
  for (const p of [
    ApparatusStep,
    ResultStep,
    ControlsStep,
    AttachmentsStep,
    ReviewStep,
    ReturnComments,
    SubmittedCard,
  ]) {
    p.preload().catch(() => {
      // Shown when the part is rendered (next/dynamic's own import fails there).
      preloaded = false;
    });
  }
}
