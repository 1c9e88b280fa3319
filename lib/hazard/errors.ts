// The one error the engine throws on purpose: input it refuses to compute with, named by its field
// path so a form or an API answer (422) can point at the field.

export type InputPath = (string | number)[];

/** Renders ["sources", 0, "capacitance_F"] as "sources[0].capacitance_F". */
export function formatInputPath(path: readonly (string | number)[]): string {
  let out = "";
  for (const part of path) {
    if (typeof part === "number") out += `[${part}]`;
    else out += out ? `.${part}` : part;
  }
  return out || "(input)";
}

export class HazardInputError extends Error {
  readonly path: InputPath;
  /** The path as text, e.g. "sources[0].capacitance_F". */
  readonly field: string;
  /** What is wrong, without the field name (for showing next to the field itself). */
  readonly problem: string;

  constructor(path: InputPath, problem: string) {
    const field = formatInputPath(path);
    super(`${field}: ${problem}`);
    this.name = "HazardInputError";
    this.path = [...path];
    this.field = field;
    this.problem = problem;
  }
}
