// Writes public/icons/sprite.svg: the lucide icons named in components/ui/sprite-names.ts as <symbol>s,
// drawn from lucide-react's own shapes (so they look exactly as its components draw them). Run by hand
// when the list changes; the result is committed and tests/unit/icon-sprite.test.ts checks it is current:
//   npx tsx scripts/icon-sprite.ts
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { SPRITE_ICONS } from "../components/ui/sprite-names";

type Shape = [tag: string, attrs: Record<string, string | number>];
type IconData = { size?: number; node: Shape[] };

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
export const SPRITE_FILE = path.join(root, "public", "icons", "sprite.svg");

const xml = (v: string | number) => String(v).replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/"/g, "&quot;");

/** An icon's shapes; a name lucide-react keeps as an alias (triangle-alert) re-exports another file. */
async function iconData(name: string): Promise<IconData> {
  const file = path.join(root, "node_modules", "lucide-react", "dist", "esm", "icons", `${name}.mjs`);
  const alias = /export \{ default \} from '\.\/([a-z0-9-]+)\.mjs'/.exec(fs.readFileSync(file, "utf8"));
  if (alias) return iconData(alias[1]!);
  const mod = (await import(file)) as { __iconData?: IconData };
  if (!mod.__iconData) throw new Error(`lucide-react/icons/${name} has no shapes to read`);
  return mod.__iconData;
}

/** The sprite's text: lucide's default stroke settings on each symbol, as its components set them on the <svg>. */
export async function spriteSvg(names: readonly string[] = SPRITE_ICONS): Promise<string> {
  const symbols: string[] = [];
  for (const name of names) {
    const { size = 24, node } = await iconData(name);
    const shapes = node.map(([tag, attrs]) => `<${tag}${Object.entries(attrs).filter(([k]) => k !== "key").map(([k, v]) => ` ${k}="${xml(v)}"`).join("")}/>`).join("");
    symbols.push(`<symbol id="${name}" viewBox="0 0 ${size} ${size}" fill="none" stroke="currentColor" stroke-width="2" stroke-linecap="round" stroke-linejoin="round">${shapes}</symbol>`);
  }
  return `<svg xmlns="http://www.w3.org/2000/svg">\n${symbols.join("\n")}\n</svg>\n`;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  fs.mkdirSync(path.dirname(SPRITE_FILE), { recursive: true });
  fs.writeFileSync(SPRITE_FILE, await spriteSvg());
  console.log(`wrote ${path.relative(root, SPRITE_FILE)} (${SPRITE_ICONS.length} icons)`);
}
