"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useId, useRef, useState } from "react";
import { Alert } from "@/app/_components/alert";
import { Button } from "@/app/_components/button";
import {
  ATTACHMENT_ACCEPT,
  ATTACHMENT_MAX_BYTES,
  ATTACHMENT_MAX_COUNT,
  ATTACHMENT_TYPES,
  formatBytes,
  isImageType,
} from "@/lib/applications/limits";
import { ApiError, apiFetch, type FieldIssue } from "@/lib/client/api";
import type { AttachmentRef } from "@/lib/applications/schemas";

// Photos and schematics. Each file goes up on its own XMLHttpRequest (for its progress bar); the
// server reads the type from the content and has the last word. A refused or failed upload is
// listed with its reason and changes nothing else in the draft.

type Upload = { key: string; name: string; progress: number; state: "uploading" | "failed"; message?: string };

type AttachmentsStepProps = {
  applicationId: string | null;
  initial: readonly AttachmentRef[];
  onChange: (attachments: AttachmentRef[]) => void;
};

function uploadFile(applicationId: string, file: File, onProgress: (fraction: number) => void): Promise<AttachmentRef> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", `/api/applications/${applicationId}/attachments`);
    xhr.responseType = "text";
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress(event.loaded / event.total);
    };
    xhr.onload = () => {
      let body: { attachment?: AttachmentRef; error?: { message?: string; issues?: FieldIssue[] } } = {};
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = {};
      }
      if (xhr.status === 201 && body.attachment) resolve(body.attachment);
      else {
        const issue = body.error?.issues?.find((i) => i.path === "file");
        reject(new ApiError(xhr.status, issue?.message ?? body.error?.message ?? `The upload failed (${xhr.status}).`));
      }
    };
    xhr.onerror = () => reject(new ApiError(0, "The upload failed: the server could not be reached. Try again."));
    const form = new FormData();
    form.append("file", file);
    xhr.send(form);
  });
}

const ALLOWED_EXTENSIONS = /\.(jpe?g|png|webp|pdf)$/i;

/** The browser's own check, with the server's words; the server checks the content again. */
function precheck(file: File, count: number): string | null {
  if (count >= ATTACHMENT_MAX_COUNT)
    return `An application can have at most ${ATTACHMENT_MAX_COUNT} files; remove one first.`;
  if (file.size === 0) return "The file is empty.";
  if (file.size > ATTACHMENT_MAX_BYTES) {
    return `The file is ${formatBytes(file.size)}; each file may be at most ${formatBytes(ATTACHMENT_MAX_BYTES)}.`;
  }
  if (!(file.type in ATTACHMENT_TYPES) && !ALLOWED_EXTENSIONS.test(file.name)) {
    return "Only JPEG, PNG, WebP and PDF files can be attached.";
  }
  return null;
}

export function AttachmentsStep({ applicationId, initial, onChange }: AttachmentsStepProps) {
  const queryClient = useQueryClient();
  const inputId = useId();
  const inputRef = useRef<HTMLInputElement>(null);
  const [uploads, setUploads] = useState<Upload[]>([]);
  const [removeError, setRemoveError] = useState<string | null>(null);

  const files = useQuery({
    queryKey: ["attachments", applicationId],
    queryFn: async () => {
      const res = await apiFetch<{ application: { attachments: AttachmentRef[] } }>(
        `/api/applications/${applicationId}/draft`,
      );
      return res.application.attachments;
    },
    initialData: applicationId ? [...initial] : [],
    enabled: Boolean(applicationId),
  });
  const list = files.data ?? [];

  const remove = useMutation({
    mutationFn: (attachment: AttachmentRef) =>
      apiFetch(`/api/applications/${applicationId}/attachments/${attachment.id}`, { method: "DELETE" }),
    onSuccess: async () => {
      setRemoveError(null);
      await refresh();
    },
    onError: (error) => setRemoveError(error.message),
  });

  async function refresh() {
    const next = await queryClient.fetchQuery({
      queryKey: ["attachments", applicationId],
      queryFn: async () => {
        const res = await apiFetch<{ application: { attachments: AttachmentRef[] } }>(
          `/api/applications/${applicationId}/draft`,
        );
        return res.application.attachments;
      },
      staleTime: 0,
    });
    onChange(next);
  }

  const update = (key: string, change: Partial<Upload>) =>
    setUploads((all) => all.map((u) => (u.key === key ? { ...u, ...change } : u)));

  async function onFiles(chosen: FileList | null) {
    if (!chosen || chosen.length === 0) return;
    const selected = [...chosen];
    if (inputRef.current) inputRef.current.value = "";
    const id = applicationId;
    let count = list.length;
    for (const file of selected) {
      const key = `${file.name}-${file.size}-${Math.random().toString(36).slice(2)}`;
      const problem = precheck(file, count);
      if (problem || !id) {
        setUploads((all) => [
          ...all,
          {
            key,
            name: file.name,
            progress: 0,
            state: "failed",
            message: problem ?? "Save the draft first, then try again.",
          },
        ]);
        continue;
      }
      count += 1;
      setUploads((all) => [...all, { key, name: file.name, progress: 0, state: "uploading" }]);
      try {
        await uploadFile(id, file, (fraction) => update(key, { progress: fraction }));
        setUploads((all) => all.filter((u) => u.key !== key));
        await refresh();
      } catch (error) {
        count -= 1;
        update(key, { state: "failed", message: error instanceof Error ? error.message : "The upload failed." });
      }
    }
  }

  if (!applicationId) {
    return (
      <Alert tone="warn" title="Not saved yet">
        Files can be attached once the draft has been saved; see the saving state at the top of the form.
      </Alert>
    );
  }

  return (
    <div className="flex flex-col gap-5">
      <div>
        <label htmlFor={inputId} className="text-sm font-medium text-stone-800">
          Add photos or schematics
        </label>
        <p id={`${inputId}-hint`} className="mt-0.5 text-xs text-stone-600">
          JPEG, PNG, WebP or PDF; at most {formatBytes(ATTACHMENT_MAX_BYTES)} each and {ATTACHMENT_MAX_COUNT} per
          application ({list.length} attached).
        </p>
        <input
          ref={inputRef}
          id={inputId}
          type="file"
          multiple
          accept={ATTACHMENT_ACCEPT}
          aria-describedby={`${inputId}-hint`}
          disabled={list.length >= ATTACHMENT_MAX_COUNT}
          onChange={(e) => void onFiles(e.target.files)}
          className="mt-2 block text-sm text-stone-800 file:mr-3 file:rounded-md file:border file:border-stone-300 file:bg-white file:px-3 file:py-1.5 file:text-sm file:font-medium file:text-stone-800 hover:file:bg-stone-50"
        />
      </div>

      <div aria-live="polite" className="flex flex-col gap-2">
        {uploads.map((u) =>
          u.state === "uploading" ? (
            <div key={u.key} className="text-sm text-stone-800">
              <p>
                Uploading {u.name}… <span className="figure">{Math.round(u.progress * 100)} %</span>
              </p>
              <progress
                className="mt-1 h-2 w-full accent-ink-700"
                max={1}
                value={u.progress}
                aria-label={`Upload of ${u.name}`}
              />
            </div>
          ) : (
            <Alert key={u.key} tone="error" title={`${u.name} was not attached`}>
              {u.message}{" "}
              <button
                type="button"
                className="underline"
                onClick={() => setUploads((all) => all.filter((x) => x.key !== u.key))}
              >
                Dismiss
              </button>
            </Alert>
          ),
        )}
        {removeError && <Alert tone="error">{removeError}</Alert>}
      </div>

      {list.length === 0 ? (
        <p className="text-sm text-stone-600">No files attached. Photos of the set-up help the reviewer.</p>
      ) : (
        <ul className="grid gap-3 sm:grid-cols-2" aria-label="Attached files">
          {list.map((a) => {
            const url = `/api/applications/${applicationId}/attachments/${a.id}`;
            return (
              <li
                key={a.id}
                className="flex items-center gap-3 rounded-lg border border-stone-200 bg-white p-2"
                data-attachment={a.filename}
              >
                {isImageType(a.contentType) ? (
                  // Served by our authorized route; next/image would proxy it through another one.
                  // eslint-disable-next-line @next/next/no-img-element
                  <img
                    src={url}
                    alt={`Thumbnail of ${a.filename}`}
                    width={64}
                    height={64}
                    className="size-16 rounded object-cover"
                  />
                ) : (
                  <span
                    aria-hidden="true"
                    className="flex size-16 items-center justify-center rounded bg-stone-100 text-xs font-semibold text-stone-700"
                  >
                    PDF
                  </span>
                )}
                <div className="min-w-0 flex-1 text-sm">
                  <a href={`${url}?download=1`} className="block truncate text-ink-800 underline decoration-ink-300">
                    {a.filename}
                  </a>
                  <span className="figure text-xs text-stone-600">{formatBytes(a.size_B)}</span>
                </div>
                <Button variant="ghost" size="sm" disabled={remove.isPending} onClick={() => remove.mutate(a)}>
                  Remove<span className="sr-only"> {a.filename}</span>
                </Button>
              </li>
            );
          })}
        </ul>
      )}
    </div>
  );
}
