import type { FieldValues, Path, UseFormSetError } from "react-hook-form";
import { ApiError } from "./api";

// The one way a form shows what the server refused: the API's 422 names each field
// ({ path, message }), and the message goes next to that field. react-hook-form forms use
// applyApiIssues; forms that keep their own state use issuesByField.

type ApplyOptions<T extends FieldValues> = {
  /** Only these fields take issues; the others stay in the error's message. Default: every path. */
  fields?: readonly Path<T>[];
  /** The form's name for a server path (e.g. "sources[0].id" → "sources.0.label"). Default: as is. */
  nameOf?: (path: string) => string;
};

/** Puts an ApiError's field issues on the form's fields. True when at least one was placed. */
export function applyApiIssues<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  options: ApplyOptions<T> = {},
): boolean {
  if (!(error instanceof ApiError)) return false;
  let applied = false;
  for (const issue of error.issues) {
    const name = (options.nameOf ? options.nameOf(issue.path) : issue.path) as Path<T>;
    if (options.fields && !options.fields.includes(name)) continue;
    setError(name, { message: issue.message });
    applied = true;
  }
  return applied;
}

/** The first message for each of `fields` (by the path's first segment) in an ApiError's issues. */
export function issuesByField<K extends string>(error: unknown, fields: readonly K[]): Partial<Record<K, string>> {
  const found: Partial<Record<K, string>> = {};
  if (!(error instanceof ApiError)) return found;
  for (const issue of error.issues) {
    const key = issue.path.split(/[.[]/)[0] as K;
    if (fields.includes(key) && found[key] === undefined) found[key] = issue.message;
  }
  return found;
}
