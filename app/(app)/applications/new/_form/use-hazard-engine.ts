"use client";

import { useEffect, useState } from "react";

// The hazard engine is about a quarter of the form's code and step 1 does not use it, so the form
// fetches it with import() when first needed: on the first edit (it is needed one step later) or
// on opening any later step. Once fetched it stays for the page's life (a module-level cache, so a
// form mounted again renders its figures at once).

export type HazardEngine = typeof import("./live-engine");

let loading: Promise<HazardEngine> | null = null;
let loaded: HazardEngine | null = null;

/** Starts (or joins) the download (a failure is kept by the bundler's runtime: the form offers a reload). */
export function loadHazardEngine(): Promise<HazardEngine> {
  loading ??= import("./live-engine").then(
    (engine) => (loaded = engine),
    (error: unknown) => {
      loading = null;
      throw error;
    },
  );
  return loading;
}

export type HazardEngineState = { engine: HazardEngine | null; failed: boolean };

export function useHazardEngine(needed: boolean): HazardEngineState {
  const [engine, setEngine] = useState<HazardEngine | null>(loaded);
  const [failed, setFailed] = useState(false);
  useEffect(() => {
    if (!needed || engine) return;
    let current = true;
    loadHazardEngine().then(
      (e) => {
        if (current) setEngine(() => e);
      },
      () => {
        if (current) setFailed(true);
      },
    );
    return () => {
      current = false;
    };
  }, [needed, engine]);
  return { engine, failed: failed && !engine };
}
