// Writes the app's icons into public/ from app/icon.svg (run by hand when the mark changes; the
// results are committed): PNGs for the web app manifest and iOS, and favicon.ico (one 32 px PNG in an
// ICO container, which every browser reads).
import fs from "node:fs";
import path from "node:path";
import sharp from "sharp";

const root = path.resolve(import.meta.dirname, "..");
const svg = fs.readFileSync(path.join(root, "app", "icon.svg"));
const out = (name) => path.join(root, "public", name);
const png = (size) => sharp(svg, { density: 72 * (size / 24) }).resize(size, size).png().toBuffer();

for (const [name, size] of [["icon-192.png", 192], ["icon-512.png", 512], ["apple-touch-icon.png", 180]]) {
  fs.writeFileSync(out(name), await png(size));
}
fs.copyFileSync(path.join(root, "app", "icon.svg"), out("icon.svg"));

const fav = await png(32);
const header = Buffer.alloc(6 + 16);
header.writeUInt16LE(0, 0); // reserved
header.writeUInt16LE(1, 2); // type: icon
header.writeUInt16LE(1, 4); // one image
header.writeUInt8(32, 6); // width
header.writeUInt8(32, 7); // height
header.writeUInt8(0, 8); // no palette
header.writeUInt8(0, 9);
header.writeUInt16LE(1, 10); // planes
header.writeUInt16LE(32, 12); // bits per pixel
header.writeUInt32LE(fav.length, 14);
header.writeUInt32LE(22, 18); // offset of the PNG
fs.writeFileSync(out("favicon.ico"), Buffer.concat([header, fav]));
console.log("icons written to public/");
