// Browser-side JSON calls to our own API routes. Errors come back as ApiError with the field issues
// the server named, so forms can show each message next to its field.

export type FieldIssue = { path: string; message: string };

export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly issues: FieldIssue[] = [],
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
    this.name = "ApiError";
  }
}

export async function apiFetch<T>(
  url: string,
  init: { method?: string; body?: unknown; signal?: AbortSignal } = {},
): Promise<T> {
  let res: Response;
  try {
    res = await fetch(url, {
      method: init.method ?? (init.body === undefined ? "GET" : "POST"),
      headers: init.body === undefined ? undefined : { "Content-Type": "application/json" },
      body: init.body === undefined ? undefined : JSON.stringify(init.body),
      signal: init.signal,
      credentials: "same-origin",
    });
  } catch (error) {
    if (error instanceof DOMException && error.name === "AbortError") throw error;
    throw new ApiError(0, "The server could not be reached. Check the connection and try again.");
  }
  const text = await res.text();
  const json = text ? safeParse(text) : undefined;
  if (!res.ok) {
    const err = (json as { error?: { message?: string; issues?: FieldIssue[] } } | undefined)?.error;
    const retry = res.headers.get("Retry-After");
    throw new ApiError(
      res.status,
      err?.message ?? `The request failed (${res.status}).`,
      err?.issues ?? [],
      retry ? Number(retry) : undefined,
    );
  }
  return json as T;
}

function safeParse(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}
