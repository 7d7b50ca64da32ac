import { SPRITE_URL, type SpriteIconName } from "@/components/ui/sprite-names";

/**
 * A lucide icon from the cached sprite (public/icons/sprite.svg, scripts/icon-sprite.ts): an <svg> holding
 * one <use>, drawn as lucide-react draws it, always decorative (aria-hidden; the words beside it carry the
 * meaning). For pages that show many icons: a lucide-react icon is a client component of up to seven
 * elements that the server renders twice (page payload, then HTML), this is two plain ones. The size
 * comes from `className` (size-4, size-5, …).
 */
export function SpriteIcon({ name, className }: { name: SpriteIconName; className: string }) {
  return (
    <svg aria-hidden className={className}>
      <use href={`${SPRITE_URL}#${name}`} />
    </svg>
  );
}
