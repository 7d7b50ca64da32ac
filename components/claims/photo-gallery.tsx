"use client";

import { useEffect, useRef, useState } from "react";
import { SpriteIcon } from "@/components/ui/sprite-icon";

export type GalleryPhoto = { id: string; url: string; thumbUrl: string; width: number; height: number };

/** Large thumbnails; a tap opens the full-size photo in a dialog with previous/next. */
export function PhotoGallery({ photos, label = "Photos" }: { photos: GalleryPhoto[]; label?: string }) {
  const [open, setOpen] = useState<number | null>(null);
  const dialog = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    if (open === null) dialog.current?.close();
    else if (!dialog.current?.open) dialog.current?.showModal();
  }, [open]);
  if (photos.length === 0) return <p className="text-sm text-muted">No photos yet.</p>;
  const current = open === null ? null : photos[open];
  const step = (d: number) => setOpen((i) => (i === null ? null : (i + d + photos.length) % photos.length));
  return (
    <>
      <ul className="grid grid-cols-2 gap-2 sm:grid-cols-3" aria-label={label}>
        {photos.map((p, i) => (
          <li key={p.id}>
            <button type="button" onClick={() => setOpen(i)} className="block w-full overflow-hidden rounded-lg border border-line bg-white" aria-label={`Open photo ${i + 1} of ${photos.length} full size`}>
              {/* eslint-disable-next-line @next/next/no-img-element -- served by our authorized file route */}
              <img src={p.thumbUrl} alt={`Photo ${i + 1}`} width={p.width} height={p.height} className="aspect-[4/3] w-full object-cover" loading="lazy" />
            </button>
          </li>
        ))}
      </ul>
      <dialog
        ref={dialog}
        onClose={() => setOpen(null)}
        onKeyDown={(e) => {
          if (e.key === "ArrowRight") step(1);
          if (e.key === "ArrowLeft") step(-1);
        }}
        aria-label="Photo viewer"
        className="m-auto h-full max-h-none w-full max-w-none bg-ink/95 p-0 text-white backdrop:bg-ink/80"
      >
        {current ? (
          <div className="flex h-full flex-col">
            <div className="flex items-center justify-between p-2">
              <span className="px-2 text-sm">
                Photo {open! + 1} of {photos.length} · {current.width} × {current.height}
              </span>
              <div className="flex gap-1">
                <a href={current.url} target="_blank" rel="noreferrer" className="flex min-h-11 items-center rounded-md px-3 text-sm underline">
                  Open original
                </a>
                <button type="button" onClick={() => setOpen(null)} className="flex min-h-11 min-w-11 items-center justify-center rounded-md hover:bg-white/10" aria-label="Close the photo">
                  <SpriteIcon name="x" className="size-6" />
                </button>
              </div>
            </div>
            <div className="relative flex min-h-0 flex-1 items-center justify-center">
              {/* eslint-disable-next-line @next/next/no-img-element -- full-size image from our authorized file route */}
              <img src={current.url} alt={`Photo ${open! + 1}, full size`} className="max-h-full max-w-full object-contain" />
              {photos.length > 1 ? (
                <>
                  <button type="button" onClick={() => step(-1)} className="absolute left-2 flex size-12 items-center justify-center rounded-full bg-ink/60 hover:bg-ink" aria-label="Previous photo">
                    <SpriteIcon name="chevron-left" className="size-7" />
                  </button>
                  <button type="button" onClick={() => step(1)} className="absolute right-2 flex size-12 items-center justify-center rounded-full bg-ink/60 hover:bg-ink" aria-label="Next photo">
                    <SpriteIcon name="chevron-right" className="size-7" />
                  </button>
                </>
              ) : null}
            </div>
          </div>
        ) : null}
      </dialog>
    </>
  );
}
