// The standard caution, shared by every result screen, permit, bench card and e-mail. Keep the three
// points (an estimate; codes, rules and a qualified person govern; de-energise and ground) together.
export const CAUTION_POINTS = [
  "The figures are an engineering estimate.",
  "Local codes, your institution’s rules and a qualified person’s judgement govern.",
  "De-energise and ground a set-up before anyone touches it.",
] as const;

export const CAUTION_TEXT = CAUTION_POINTS.join(" ");
