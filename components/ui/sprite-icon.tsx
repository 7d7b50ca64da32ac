import { SPRITE_URL, type SpriteIconName } from "@/components/ui/sprite-names";

/**
 * The one way the app draws an icon: a lucide icon from the cached sprite (public/icons/sprite.svg, written
 * by scripts/icon-sprite.ts), an <svg> holding one <use>, drawn as lucide-react draws it. Always decorative
 * (aria-hidden): the words beside it carry the meaning, or sr-only words or the control's aria-label where
 * there are none. The size and colour come from `className` (size-4, size-5, text-…); lucide-react itself
 * is imported by the script only (eslint.config.mjs).
 */
export function SpriteIcon({ name, className }: { name: SpriteIconName; className: string }) {
  return (
    <svg aria-hidden className={className}>
      <use href={`${SPRITE_URL}#${name}`} />
    </svg>
  );
}
