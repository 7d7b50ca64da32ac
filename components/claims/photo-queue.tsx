"use client";

import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { cn } from "@/components/ui/cn";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { ApiError, apiJson, uploadForm } from "@/components/api-client";

type UploadedPhoto = { id: string; url: string; thumbUrl: string; width: number; height: number };

// Photos picked for a claim, each uploaded in its own request with a progress bar, retry and remove.
// Until a photo is uploaded its bytes wait in IndexedDB under the draft's key, so a reload keeps them.

export const MAX_PHOTOS = 10;
const MAX_BYTES = 15 * 1024 * 1024;
const ACCEPT = "image/jpeg,image/png,image/webp";

export type QueueItem = {
  key: string;
  name: string;
  blob: Blob;
  /** "refused": the server will never take this file (not an image it can read, too large, no room left); retrying can't help, removing it can. */
  status: "waiting" | "uploading" | "done" | "error" | "refused";
  progress: number;
  error?: string;
  photo?: UploadedPhoto;
};

/** The browser-side first look at a file; the server checks the content again. */
/** Answers that stay the same however often the photo is sent again (lib/errors statuses). */
const REFUSED_FOR_GOOD = new Set([409, 413, 415, 422]);

/** The photos still to send: neither uploaded nor refused for good. */
export const stillToUpload = (items: QueueItem[]) => items.filter((i) => i.status !== "done" && i.status !== "refused");

export function photoProblem(file: File): string | null {
  if (/\.(heic|heif)$/i.test(file.name) || /heic|heif/i.test(file.type)) {
    return `${file.name} is a HEIC photo, which we can't read. Send it as a JPEG: on an iPhone choose Settings → Camera → Formats → Most Compatible, or share the photo to yourself by e-mail (iPhones convert it to JPEG), or take a screenshot of it.`;
  }
  if (file.type && !ACCEPT.split(",").includes(file.type)) return `${file.name} isn't a JPEG, PNG or WebP photo.`;
  if (file.size > MAX_BYTES) return `${file.name} is ${(file.size / 1024 / 1024).toFixed(1)} MB; the limit is 15 MB.`;
  return null;
}

// ---- a tiny IndexedDB store: { key, draftKey, name, blob, photo? }

const DB_NAME = "grainward-claim-drafts";
function openDb(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    const req = indexedDB.open(DB_NAME, 1);
    req.onupgradeneeded = () => req.result.createObjectStore("photos", { keyPath: "key" }).createIndex("draft", "draftKey");
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error);
  });
}
type StoredPhoto = { key: string; draftKey: string; name: string; blob: Blob; photo?: UploadedPhoto; order: number };
async function idb<T>(mode: IDBTransactionMode, fn: (s: IDBObjectStore) => IDBRequest<T>): Promise<T> {
  const db = await openDb();
  return new Promise((resolve, reject) => {
    const req = fn(db.transaction("photos", mode).objectStore("photos"));
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error);
  });
}
const idbSafe = async <T,>(p: () => Promise<T>): Promise<T | undefined> => {
  try {
    return await p();
  } catch {
    return undefined; // private mode or no IndexedDB: the queue still works, it just won't survive a reload
  }
};

export async function clearDraftPhotos(draftKey: string) {
  const all = (await idbSafe(() => idb<StoredPhoto[]>("readonly", (s) => s.index("draft").getAll(draftKey)))) ?? [];
  await Promise.all(all.map((p) => idbSafe(() => idb("readwrite", (s) => s.delete(p.key)))));
}

export function usePhotoQueue(draftKey: string) {
  const [items, setItems] = useState<QueueItem[]>([]);
  const [loaded, setLoaded] = useState(false);
  // Why the last pick left files out, shown under the picker until the next pick (a toast at the bottom
  // of a phone's screen would cover the form's send button while it showed).
  const [refused, setRefused] = useState<string[]>([]);
  const itemsRef = useRef(items);
  useEffect(() => {
    itemsRef.current = items;
  }, [items]);

  useEffect(() => {
    let live = true;
    void idbSafe(() => idb<StoredPhoto[]>("readonly", (s) => s.index("draft").getAll(draftKey))).then((rows) => {
      if (!live) return;
      const restored = (rows ?? []).sort((a, b) => a.order - b.order).map<QueueItem>((r) => ({ key: r.key, name: r.name, blob: r.blob, status: r.photo ? "done" : "waiting", progress: r.photo ? 1 : 0, photo: r.photo }));
      setItems((cur) => [...restored, ...cur.filter((c) => !restored.some((r) => r.key === c.key))]);
      setLoaded(true);
    });
    return () => {
      live = false;
    };
  }, [draftKey]);

  const patch = useCallback((key: string, p: Partial<QueueItem>) => setItems((cur) => cur.map((i) => (i.key === key ? { ...i, ...p } : i))), []);

  /** `taken`: photos already on the claim, outside this queue (a sent claim's page); they use up room too. */
  const add = useCallback(
    (files: FileList | File[], taken = 0) => {
      const list = Array.from(files);
      const room = MAX_PHOTOS - taken - itemsRef.current.filter((i) => i.status !== "refused").length;
      const problems: string[] = [];
      if (list.length > room) problems.push(`A claim holds at most ${MAX_PHOTOS} photos; ${room <= 0 ? "remove one first" : `only the first ${room} were added`}.`);
      const added: QueueItem[] = [];
      for (const file of list.slice(0, Math.max(0, room))) {
        const problem = photoProblem(file);
        if (problem) {
          problems.push(problem);
          continue;
        }
        const key = `${draftKey}:${crypto.randomUUID()}`;
        added.push({ key, name: file.name, blob: file, status: "waiting", progress: 0 });
        void idbSafe(() => idb("readwrite", (s) => s.put({ key, draftKey, name: file.name, blob: file, order: Date.now() + added.length } satisfies StoredPhoto)));
      }
      setItems((cur) => [...cur, ...added]);
      setRefused(problems);
      return added;
    },
    [draftKey],
  );

  /** Forgets the photos that are uploaded (they now show with the claim). */
  const pruneDone = useCallback(() => {
    setItems((cur) => {
      // Deleting twice (strict mode calls updaters twice) is harmless.
      for (const i of cur) if (i.status === "done") void idbSafe(() => idb("readwrite", (s) => s.delete(i.key)));
      return cur.filter((i) => i.status !== "done");
    });
  }, []);

  const uploadOne = useCallback(
    async (item: QueueItem, claimId: string): Promise<boolean> => {
      patch(item.key, { status: "uploading", progress: 0, error: undefined });
      try {
        const form = new FormData();
        form.append("file", item.blob, item.name);
        const { photo } = await uploadForm<{ photo: UploadedPhoto }>(`/api/claims/${claimId}/photos`, form, (f) => patch(item.key, { progress: f }));
        patch(item.key, { status: "done", progress: 1, photo });
        void idbSafe(() => idb("readwrite", (s) => s.put({ key: item.key, draftKey, name: item.name, blob: item.blob, photo, order: Date.now() } satisfies StoredPhoto)));
        return true;
      } catch (e) {
        const forGood = e instanceof ApiError && REFUSED_FOR_GOOD.has(e.status);
        patch(item.key, { status: forGood ? "refused" : "error", error: e instanceof ApiError ? e.message : "The upload failed. Try again." });
        return false;
      }
    },
    [draftKey, patch],
  );

  /** Uploads every photo not yet uploaded, one request at a time; true when all are up. */
  const uploadAll = useCallback(
    async (claimId: string) => {
      let ok = true;
      for (const item of stillToUpload(itemsRef.current)) ok = (await uploadOne(item, claimId)) && ok;
      return ok;
    },
    [uploadOne],
  );

  const remove = useCallback(
    async (item: QueueItem, claimId?: string) => {
      if (item.status === "done" && item.photo && claimId) {
        try {
          await apiJson(`/api/claims/${claimId}/photos/${item.photo.id}`, { method: "DELETE" });
        } catch (e) {
          toast.error(e instanceof Error ? e.message : "Could not remove the photo.");
          return;
        }
        toast.success("Photo removed.");
      }
      void idbSafe(() => idb("readwrite", (s) => s.delete(item.key)));
      setItems((cur) => cur.filter((i) => i.key !== item.key));
    },
    [],
  );

  return { items, loaded, refused, add, uploadOne, uploadAll, remove, pruneDone };
}

/** The picker's button: how many are added and how many a claim takes, in words. */
function photoButtonWords(count: number): string {
  if (count >= MAX_PHOTOS) return `${MAX_PHOTOS} photos added — the most a claim takes`;
  return count === 0 ? `Add photos — up to ${MAX_PHOTOS}` : `Add photos — ${count} added, up to ${MAX_PHOTOS}`;
}

export function PhotoPicker({ onFiles, disabled, count, refused = [] }: { onFiles: (f: FileList) => void; disabled?: boolean; count: number; refused?: string[] }) {
  const ref = useRef<HTMLInputElement>(null);
  return (
    <div className="space-y-1.5">
      <input
        ref={ref}
        id="claim-photos"
        type="file"
        accept={`${ACCEPT},.heic,.heif`}
        multiple
        className="sr-only"
        aria-label="Add photos"
        disabled={disabled || count >= MAX_PHOTOS}
        onChange={(e) => {
          if (e.target.files?.length) onFiles(e.target.files);
          e.target.value = "";
        }}
      />
      <Button variant="secondary" className="w-full sm:w-auto" disabled={disabled || count >= MAX_PHOTOS} onClick={() => ref.current?.click()}>
        <SpriteIcon name="image-plus" className="size-5" /> {photoButtonWords(count)}
      </Button>
      <p className="text-sm text-muted">JPEG, PNG or WebP, up to 15 MB each. One close-up and one of the whole piece help most.</p>
      {refused.length ? (
        <div role="alert" className="space-y-1 text-sm font-medium text-danger">
          {refused.map((r, i) => (
            <p key={i}>{r}</p>
          ))}
        </div>
      ) : null}
    </div>
  );
}

function Preview({ blob, alt }: { blob: Blob; alt: string }) {
  const url = useMemo(() => URL.createObjectURL(blob), [blob]);
  // A file the browser can't draw showed its broken-image sign with the file name spilling out of the square.
  const [unreadable, setUnreadable] = useState(false);
  useEffect(() => () => URL.revokeObjectURL(url), [url]);
  if (!url || unreadable) {
    return (
      <span className="flex size-16 shrink-0 items-center justify-center rounded-md bg-line text-muted" data-testid="no-preview">
        <SpriteIcon name="image-plus" className="size-6" />
      </span>
    );
  }
  // eslint-disable-next-line @next/next/no-img-element -- a local blob preview, not a served image
  return <img src={url} alt={alt} onError={() => setUnreadable(true)} className="size-16 shrink-0 overflow-hidden rounded-md object-cover" />;
}

export function PhotoQueueList({ items, onRetry, onRemove, busy }: { items: QueueItem[]; onRetry?: (i: QueueItem) => void; onRemove: (i: QueueItem) => void; busy?: boolean }) {
  // An uploaded photo is on the claim already: removing it is asked first, in the app's own dialog.
  const [asking, setAsking] = useState<QueueItem | null>(null);
  if (items.length === 0) return null;
  return (
    <>
      <ConfirmDialog
        open={asking !== null}
        title={`Remove ${asking?.name ?? "the photo"} from the claim?`}
        confirmLabel="Remove the photo"
        cancelLabel="Keep the photo"
        onCancel={() => setAsking(null)}
        onConfirm={() => {
          if (asking) onRemove(asking);
          setAsking(null);
        }}
      >
        <p>The studio will no longer see it with your claim.</p>
      </ConfirmDialog>
      <ul className="space-y-2" aria-label="Photos">
        {items.map((item) => (
          <li key={item.key} className="flex items-center gap-3 rounded-lg border border-line bg-white p-2">
            <Preview blob={item.blob} alt={item.name} />
            <div className="min-w-0 flex-1 space-y-1">
              <p className="truncate text-sm font-medium">{item.name}</p>
              <div
                role="progressbar"
                aria-label={`Upload of ${item.name}`}
                aria-valuemin={0}
                aria-valuemax={100}
                aria-valuenow={Math.round(item.progress * 100)}
                className="h-2 overflow-hidden rounded-full bg-line"
              >
                <div className={cn("h-full transition-[width]", item.status === "error" || item.status === "refused" ? "bg-danger" : "bg-resin")} style={{ width: `${Math.round(item.progress * 100)}%` }} />
              </div>
              <p className={cn("text-xs", item.status === "error" || item.status === "refused" ? "font-medium text-danger" : "text-muted")}>
                {item.status === "waiting" && "Waiting to upload"}
                {item.status === "uploading" && `Uploading… ${Math.round(item.progress * 100)} %`}
                {item.status === "done" && "Uploaded"}
                {(item.status === "error" || item.status === "refused") && item.error}
              </p>
            </div>
            {item.status === "error" && onRetry ? (
              <Button variant="ghost" className="px-2" aria-label={`Retry ${item.name}`} onClick={() => onRetry(item)} disabled={busy}>
                <SpriteIcon name="rotate-ccw" className="size-5" />
              </Button>
            ) : null}
            <Button variant="ghost" className="px-2" aria-label={`Remove ${item.name}`} onClick={() => (item.status === "done" && item.photo ? setAsking(item) : onRemove(item))} disabled={busy || item.status === "uploading"}>
              <SpriteIcon name="trash" className="size-5" />
            </Button>
          </li>
        ))}
      </ul>
    </>
  );
}
