// Words for people: every exclusion a warranty line can name has words for
// owners (lib/owner/warranty EXCLUSION_LABELS) and for staff (CLAIM_EXCLUSION_LABELS); no raw key
// such as sun_on_resin reaches a page, the certificate or the coverage summary.
import { describe, expect, it } from "vitest";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { CLAIM_EXCLUSION_LABELS, CLAIM_EXCLUSIONS } from "@/lib/care/vocabulary";
import { EXCLUSION_LABELS, exclusionLabel, warrantyLinesFor } from "@/lib/owner/warranty";

describe("exclusion labels", () => {
  it.each(CLAIM_EXCLUSIONS)("%s has owner words and staff words, neither with an underscore", (kind) => {
    const owner = (EXCLUSION_LABELS as Record<string, string | undefined>)[kind];
    expect(owner, `owner label for ${kind}`).toBeTruthy();
    expect(owner).not.toContain("_");
    expect(exclusionLabel(kind)).toBe(owner);
    const staff = (CLAIM_EXCLUSION_LABELS as Record<string, string | undefined>)[kind];
    expect(staff, `staff label for ${kind}`).toBeTruthy();
    expect(staff).not.toContain("_");
  });

  it("sun on resin reads as words on an outdoor resin piece's warranty lines under the default terms", () => {
    const lines = warrantyLinesFor(DEFAULT_WARRANTY_POLICY, "2026-01-10", "2026-06-01", true, { resin: "deep_pour", use: "outdoor_covered" });
    const resin = lines.find((l) => l.category === "resin_clouding")!;
    expect(resin.exclusions).toContain("sun_on_resin");
    const words = resin.exclusions.map(exclusionLabel);
    expect(words).toContain("sun on the resin (resin yellows in daylight)");
    for (const w of lines.flatMap((l) => l.exclusions.map(exclusionLabel))) expect(w).not.toContain("_");
  });

  it("a stored key the vocabulary no longer lists still reads as words", () => {
    expect(exclusionLabel("water_rings_near_vases")).toBe("water rings near vases");
  });
});
