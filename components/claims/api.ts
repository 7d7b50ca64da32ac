"use client";

/** An error answer of our JSON API: the message a person can act on, and per-field messages. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly fieldErrors: Record<string, string[]> = {},
  ) {
    super(message);
  }
}

export async function apiJson<T>(url: string, init?: RequestInit): Promise<T> {
  const res = await fetch(url, { ...init, headers: { ...(init?.body ? { "content-type": "application/json" } : {}), ...init?.headers } });
  const body = await res.json().catch(() => null);
  if (!res.ok) throw new ApiError(res.status, body?.error?.message ?? `The server answered ${res.status}.`, body?.error?.fieldErrors);
  return body as T;
}

export type UploadedPhoto = { id: string; url: string; thumbUrl: string; width: number; height: number };

/** POSTs one photo with XMLHttpRequest, so upload progress can be shown. */
export function uploadPhoto(claimId: string, file: Blob, name: string, onProgress: (fraction: number) => void, signal?: AbortSignal): Promise<UploadedPhoto> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", `/api/claims/${claimId}/photos`);
    xhr.responseType = "json";
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      const body = xhr.response as { photo?: UploadedPhoto; error?: { message?: string } } | null;
      if (xhr.status === 201 && body?.photo) resolve(body.photo);
      else reject(new ApiError(xhr.status, body?.error?.message ?? `The upload failed (${xhr.status}).`));
    };
    xhr.onerror = () => reject(new ApiError(0, "The connection dropped during the upload. Try again."));
    xhr.onabort = () => reject(new ApiError(0, "Upload cancelled."));
    signal?.addEventListener("abort", () => xhr.abort());
    const form = new FormData();
    form.append("file", file, name);
    xhr.send(form);
  });
}
