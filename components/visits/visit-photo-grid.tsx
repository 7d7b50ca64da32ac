// Photo thumbnails, each a link to the full-size image (served by the authorized file route).
export type GridPhoto = { id: string; url: string; thumbUrl: string; label: string };

export function VisitPhotoGrid({ photos, label = "Photos" }: { photos: GridPhoto[]; label?: string }) {
  if (photos.length === 0) return null;
  return (
    <ul className="grid grid-cols-3 gap-2 sm:grid-cols-4" aria-label={label}>
      {photos.map((p, i) => (
        <li key={p.id} className="relative">
          <a href={p.url} target="_blank" rel="noopener noreferrer" className="block overflow-hidden rounded-lg border border-line bg-white" aria-label={`${p.label} photo ${i + 1}, full size`}>
            {/* eslint-disable-next-line @next/next/no-img-element -- authorized, private thumbnails */}
            <img src={p.thumbUrl} alt={`${p.label} photo ${i + 1}`} className="aspect-square w-full object-cover" loading="lazy" />
          </a>
          <span aria-hidden className="absolute bottom-1 left-1 rounded bg-black/70 px-1.5 text-xs text-white">
            {p.label}
          </span>
        </li>
      ))}
    </ul>
  );
}
