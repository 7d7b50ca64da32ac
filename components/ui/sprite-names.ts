// The lucide icons in public/icons/sprite.svg (drawn by components/ui/sprite-icon.tsx), by their
// lucide-react file names. Adding one here needs `npx tsx scripts/icon-sprite.ts` (tests/unit/icon-sprite.test.ts
// fails until the file is written again).
export const SPRITE_ICONS = [
  "bell-ring",
  "calendar-clock",
  "circle-check",
  "clipboard-check",
  "droplets",
  "file-down",
  "flame",
  "hand",
  "handshake",
  "hard-hat",
  "hourglass",
  "pencil",
  "shield-check",
  "shield-off",
  "shield-x",
  "thermometer-sun",
  "triangle-alert",
  "wind",
  "zap",
] as const;

export type SpriteIconName = (typeof SPRITE_ICONS)[number];

/** Where the page finds the sprite. */
export const SPRITE_URL = "/icons/sprite.svg";
