import type { StudioBrand as Brand } from "@/lib/studio/brand";

/**
 * The studio's own name and logo above the owner's pages for its pieces, in its accent (each accent
 * keeps 4.5:1 on the page's background, lib/studio/brand.ts); Grainward's name stays small.
 */
export function StudioBrand({ brand }: { brand: Brand }) {
  return (
    <div className="mb-6 flex items-center gap-3 border-l-4 pl-3" style={{ borderColor: brand.accent }}>
      {brand.logoUrl ? (
        // eslint-disable-next-line @next/next/no-img-element -- a small stored JPEG from our own route
        <img src={brand.logoUrl} alt="" className="h-10 w-auto max-w-32 rounded object-contain" />
      ) : null}
      <div className="min-w-0">
        <p className="truncate font-display text-lg font-semibold" style={{ color: brand.accent }}>
          {brand.name}
        </p>
        <p className="text-xs text-muted">care records by Grainward</p>
      </div>
    </div>
  );
}
