// The claim form's daily temperature change reaches the coverage check: filed through
// lib/claims as the owner's form posts it, stored in °C, read back by the staff claim page's coverage
// check, named in its reasons. The care guide's limit of about 4 °C in 24 h is the Western Australian
// Museum's (Conservation and Care of Collections, 2017) as recalled — from memory (lib/care/SOURCES.md).
// °F changes convert as a difference: × 5/9 (NIST SP 811, 2008, App. B, from memory). Real SQLite file and SMTP sink.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { claims } from "@/db/schema";
import { getStaffClaim } from "@/lib/claims/view-claim";
import { claimWorld, fileClaim, NO_ANSWERS, todayUtc } from "./claims-helpers";

const daysAgo = (n: number) => new Date(Date.parse(`${todayUtc()}T00:00:00Z`) - n * 86_400_000).toISOString().slice(0, 10);

async function fileWithRoom(room: Record<string, unknown>) {
  const w = await claimWorld({ piece: { deliveredOn: daysAgo(60) } });
  const { id } = await fileClaim(w.ownerV, w.piece.id, { answers: { ...NO_ANSWERS, room } as never });
  const stored = getDb().select({ answers: claims.answers }).from(claims).where(eq(claims.id, id)).get()!.answers as { room: Record<string, unknown> };
  const { coverage } = getStaffClaim(w.staffCtx, id);
  return { stored: stored.room, check: coverage.check! };
}

describe("daily temperature change on a claim", () => {
  it("a 9 °F change is stored as 5 °C and the check says the room changed faster than the care guide allows", async () => {
    // 68 °F = 20 °C; 72 °F = 22.2 °C; a 9 °F change = 5 °C.
    const { stored, check } = await fileWithRoom({ unit: "F", driestTemp: 68, driestRh: 45, dampestTemp: 72, dampestRh: 55, dailySwingPct: 3, dailyTempSwing: 9 });
    expect(stored).toMatchObject({ unit: "C", driestTemp: 20, dampestTemp: 22.2, dailyTempSwing: 5 });
    expect(check.reasons.join("\n")).toContain("temperature changing up to 5 °C in a day");
    expect(check.reasons).toContain("the temperature changed more than about 4 °C in a day, faster than the care guide allows");
    expect(check.climate?.insideCareGuide).toBe(false);
    expect(check.suggestion).toBe("partly_covered");
  });

  it("a 3 °C change keeps an otherwise good room inside the care guide", async () => {
    const { stored, check } = await fileWithRoom({ unit: "C", driestTemp: 20, driestRh: 45, dampestTemp: 22, dampestRh: 55, dailySwingPct: 3, dailyTempSwing: 3 });
    expect(stored).toMatchObject({ unit: "C", dailyTempSwing: 3 });
    expect(check.reasons.join("\n")).toContain("temperature changing up to 3 °C in a day");
    expect(check.climate?.insideCareGuide).toBe(true);
    expect(check.suggestion).toBe("covered");
  });

  it("left empty, the check says it was not reported", async () => {
    const { check } = await fileWithRoom({ unit: "C", driestTemp: 20, driestRh: 45, dampestTemp: 22, dampestRh: 55, dailySwingPct: 3 });
    expect(check.reasons).toContain("daily temperature change not reported");
  });

  it("a change beyond the range is refused with the unit named, and nothing is filed", async () => {
    const w = await claimWorld({ piece: { deliveredOn: daysAgo(60) } });
    await expect(fileClaim(w.ownerV, w.piece.id, { answers: { ...NO_ANSWERS, room: { unit: "F", dailyTempSwing: 80 } } })).rejects.toThrow(/between 0 and 72 °F/);
    expect(getDb().select().from(claims).where(eq(claims.pieceId, w.piece.id)).all()).toHaveLength(0);
  });
});
