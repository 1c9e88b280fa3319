import { ApiError } from "./api";

// One file to an upload route (multipart/form-data, field "file"), from the browser. The server's
// message for the field "file" comes back as the ApiError's message.

export async function uploadFile<T>(url: string, file: File): Promise<T> {
  const form = new FormData();
  form.append("file", file);
  let res: Response;
  try {
    res = await fetch(url, { method: "POST", body: form, credentials: "same-origin" });
  } catch {
    throw new ApiError(0, `“${file.name}” was not uploaded: the server could not be reached. Try again.`);
  }
  const body = (await res.json().catch(() => ({}))) as {
    error?: { message?: string; issues?: { path: string; message: string }[] };
  } & T;
  if (!res.ok) {
    const issue = body.error?.issues?.find((i) => i.path === "file");
    throw new ApiError(
      res.status,
      `“${file.name}”: ${issue?.message ?? body.error?.message ?? `upload failed (${res.status})`}`,
    );
  }
  return body;
}
