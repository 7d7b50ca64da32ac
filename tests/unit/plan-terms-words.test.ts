// The plans settings name a plan's current terms by the day they were saved, in the studio's zone,
// never by a version number (app/studio/settings/plans/template-words.ts).
import { describe, expect, it } from "vitest";
import { termsAsOf, termsChangedNote } from "@/app/studio/settings/plans/template-words";

describe("plan terms in words", () => {
  it("names the day the terms were saved in the studio's zone", () => {
    const savedAt = Date.UTC(2026, 2, 2, 23, 30); // 00:30 on 3 March in Berlin, 15:30 on 2 March in Los Angeles
    expect(termsAsOf(savedAt, "Europe/Berlin")).toBe("terms as of 3 March 2026");
    expect(termsAsOf(new Date(savedAt), "America/Los_Angeles")).toBe("terms as of 2 March 2026");
  });

  it("says when terms replaced earlier ones, and never shows a version number", () => {
    expect(termsChangedNote(1)).toBeNull();
    const note = termsChangedNote(2);
    expect(note).toBe("These terms replaced earlier ones; plans bought before keep the terms they were bought under.");
    expect(`${termsAsOf(0, "UTC")} ${note}`).not.toMatch(/version/i);
  });
});
