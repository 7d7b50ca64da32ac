import fs from "node:fs";
import { describe, expect, it } from "vitest";
import { SPRITE_FILE, spriteSvg } from "@/scripts/icon-sprite";
import { SPRITE_ICONS } from "@/components/ui/sprite-names";

// The committed sprite (public/icons/sprite.svg) is what scripts/icon-sprite.ts makes from lucide-react
// today: a name added to components/ui/sprite-names.ts, or a lucide-react upgrade that redraws an icon, fails
// here until the script is run again.
describe("icon sprite", () => {
  it("is current with its list and lucide-react's shapes", async () => {
    expect(fs.readFileSync(SPRITE_FILE, "utf8")).toBe(await spriteSvg());
  });

  it("has one symbol for each listed name, each with shapes to draw", () => {
    const text = fs.readFileSync(SPRITE_FILE, "utf8");
    const symbols = [...text.matchAll(/<symbol id="([a-z0-9-]+)"[^>]*>(.*?)<\/symbol>/g)];
    expect(symbols.map((m) => m[1])).toEqual([...SPRITE_ICONS]);
    for (const [, , shapes] of symbols) expect(shapes).toMatch(/^(<(path|rect|circle|line|polyline|polygon|ellipse) [^>]+\/>)+$/);
  });

  it("draws an alias (triangle-alert) with the shapes of the icon it names", async () => {
    const alias = await spriteSvg(["triangle-alert"]);
    const named = await spriteSvg(["triangle-exclamation-point"]);
    expect(alias.replace('id="triangle-alert"', "")).toBe(named.replace('id="triangle-exclamation-point"', ""));
    expect(alias).toContain("<path d=");
  });
});
