// Set-ups written before engine 2 had gaps without wiring, and engine 1 let every gap cap every
// source. Engine 2 caps only the sources a gap is across. A stored set-up is never rewritten; when a
// draft or an apparatus is opened, its old gaps are set across the sphere terminals that have no
// voltage of their own (the only sources whose voltage a gap must set), and the user is asked to
// confirm the wiring.

import type { SetupInput } from "./types";

export type UpgradedSetup = {
  setup: SetupInput;
  /** True when gaps were wired by this upgrade: show the "confirm the wiring" notice. */
  rewired: boolean;
};

/** A set-up is from before engine 2 when it has gaps and none of them says what it is across. */
export function isPreWiringSetup(setup: SetupInput): boolean {
  const gaps = setup.gaps ?? [];
  return gaps.length > 0 && gaps.every((gap) => gap.across === undefined);
}

export function upgradeSetup(setup: SetupInput): UpgradedSetup {
  if (!setup || typeof setup !== "object" || !Array.isArray(setup.sources) || !isPreWiringSetup(setup)) {
    return { setup, rewired: false };
  }
  const terminals = setup.sources.flatMap((source, index) =>
    source && source.kind === "sphere-terminal" && source.voltage_V === undefined
      ? [typeof source.id === "string" && source.id !== "" ? source.id : `source-${index + 1}`]
      : [],
  );
  return {
    setup: { ...setup, gaps: (setup.gaps ?? []).map((gap) => ({ ...gap, across: [...terminals] })) },
    rewired: true,
  };
}
