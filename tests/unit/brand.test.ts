// The studio accents keep AA contrast. Checked with the formulas of WCAG 2.2, definitions: relative
// luminance, contrast ratio (W3C Recommendation, 5 October 2023), and AA's 4.5:1 for normal text from
// WCAG 2.2, success criterion 1.4.3 Contrast (Minimum).
import { describe, expect, it } from "vitest";
import { ACCENT_NAMES, ACCENTS, BRAND_SURFACES, accentOf, brandOf, contrastRatio, relativeLuminance } from "@/lib/studio/brand";

describe("WCAG 2.2 relative luminance and contrast ratio", () => {
  it("gives the definitions' end points: black 0, white 1, black on white 21:1", () => {
    // WCAG 2.2, definitions: relative luminance ("normalized to 0 for darkest black and 1 for lightest white").
    expect(relativeLuminance("#000000")).toBe(0);
    expect(relativeLuminance("#ffffff")).toBeCloseTo(1, 10);
    // WCAG 2.2, definitions: contrast ratio ("range from 1 to 21 (commonly written 1:1 to 21:1)").
    expect(contrastRatio("#000000", "#ffffff")).toBeCloseTo(21, 10);
    expect(contrastRatio("#ffffff", "#000000")).toBeCloseTo(21, 10);
    expect(contrastRatio("#777777", "#777777")).toBe(1);
  });

  it("matches a mid grey worked by hand from the formula", () => {
    // #777777: 0x77/255 = 0.46667 → ((0.46667 + 0.055) / 1.055)^2.4 = 0.18447 (WCAG 2.2, definitions: relative luminance);
    // on white (1.05) / (0.18447 + 0.05) = 4.478, just under AA (WCAG 2.2, definitions: contrast ratio).
    expect(relativeLuminance("#777777")).toBeCloseTo(0.18447, 4);
    expect(contrastRatio("#777777", "#ffffff")).toBeCloseTo(4.478, 2);
  });
});

describe("the studio accents", () => {
  it.each(ACCENT_NAMES)("%s keeps at least 4.5:1 with white text on it and as text on every surface it is shown on", (name) => {
    // WCAG 2.2, success criterion 1.4.3 Contrast (Minimum): 4.5:1 for normal text.
    for (const surface of Object.values(BRAND_SURFACES)) {
      expect(contrastRatio(ACCENTS[name].hex, surface)).toBeGreaterThanOrEqual(4.5);
    }
  });

  it("has a few named colours of our own, each with a label, one of them Grainward's own default", () => {
    expect(ACCENT_NAMES.length).toBeGreaterThanOrEqual(5);
    expect(ACCENTS.default.hex).toBe("#0f5e5e");
    expect(new Set(Object.values(ACCENTS).map((a) => a.hex)).size).toBe(ACCENT_NAMES.length);
  });

  it("falls back to the default for a name it does not know", () => {
    expect(accentOf("neon")).toBe(ACCENTS.default);
    expect(accentOf(null)).toBe(ACCENTS.default);
  });

  it("gives the logo a public path that changes with each upload, and none without a logo", () => {
    const b = brandOf({ id: "s1", name: "Oak Test Studio", logoKey: "files/ab/abcdef0123456789.thumb.jpg", accent: "moss" }, "http://x");
    expect(b).toEqual({ name: "Oak Test Studio", logoUrl: "http://x/api/studio-logo/s1?v=abcdef01", accent: ACCENTS.moss.hex });
    expect(brandOf({ id: "s1", name: "N", logoKey: null, accent: "default" }).logoUrl).toBeNull();
  });
});
