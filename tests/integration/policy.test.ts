// Warranty policy versions: a new version applies from its date; a piece keeps the version in force
// at its delivery, so its coverage check does not change when the policy does. All data invented.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { ZodError } from "zod";
import { getDb } from "@/db/client";
import { claims, finishLayers, pieces, warrantyPolicies } from "@/db/schema";
import { CLAIM_CATEGORIES } from "@/lib/care/vocabulary";
import { claimCoverage } from "@/lib/claims/coverage";
import { AppError } from "@/lib/errors";
import { createPiece as registryCreatePiece } from "@/lib/pieces/registry";
import { createPieceSchema } from "@/lib/validation/pieces";
import { createPolicyVersion, listPolicyVersions, policyEditorValues, policyInForce } from "@/lib/settings";
import { blankLine, describePolicyChanges, formToPolicy, policyToForm } from "@/lib/settings/policy";
import { policyVersionSchema, type PolicyVersionInput } from "@/lib/validation/settings";
import { createStudio, createUser, memberContext } from "../support/fixtures";

function terms(effectiveFrom: string, finishWearMonths: number): PolicyVersionInput {
  const lines = Object.fromEntries(CLAIM_CATEGORIES.map((c) => [c, blankLine(c)])) as PolicyVersionInput["lines"];
  lines.finish_wear = { ...blankLine("finish_wear"), covered: true, label: "Finish wear (invented terms)", termMonths: finishWearMonths, exclusions: ["heat"] };
  lines.structural = { ...blankLine("structural"), covered: true, label: "Structure (invented terms)", termMonths: 60 };
  return { effectiveFrom, lines };
}

function expectAppError(fn: () => unknown, status: number) {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(AppError);
    expect((e as AppError).status).toBe(status);
    return e as AppError;
  }
  throw new Error("expected an AppError");
}

const pieceInput = (deliveredOn: string) => ({
  kind: "dining_table",
  title: "Policy test table (invented)",
  shapeKind: "rectangle",
  lengthMm: 2000,
  widthMm: 900,
  primarySpeciesId: "black_walnut",
  use: "heavy",
  deliveredOn,
  layers: [{ surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: deliveredOn }],
});

function coverageFor(pieceId: string, claimId: string) {
  const db = getDb();
  const piece = db.select().from(pieces).where(eq(pieces.id, pieceId)).get()!;
  const claim = db.select().from(claims).where(eq(claims.id, claimId)).get()!;
  const policyRow = piece.warrantyPolicyId ? db.select().from(warrantyPolicies).where(eq(warrantyPolicies.id, piece.warrantyPolicyId)).get()! : null;
  return claimCoverage({
    claim,
    piece,
    layers: db.select().from(finishLayers).where(eq(finishLayers.pieceId, pieceId)).all(),
    careLog: [],
    products: [],
    policyRow,
    ownerships: [],
    timeZone: "America/New_York",
  });
}

describe("warranty policy versions", () => {
  it("a change does not alter the coverage check of a piece delivered before it", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const staff = await memberContext(studio, "staff");
    const owner = await createUser();

    const v1 = createPolicyVersion(admin, terms("2025-01-01", 12), new Date("2025-01-01T15:00:00Z"));
    expect(v1.version).toBe(1);

    // Recorded through the registry (lib/pieces), which stamps the version in force at delivery.
    const { piece } = registryCreatePiece(staff, createPieceSchema.parse(pieceInput("2025-06-01")));
    const stamped = getDb().select({ w: pieces.warrantyPolicyId }).from(pieces).where(eq(pieces.id, piece.id)).get()!.w;
    expect(stamped).toBe(v1.id);
    expect(policyInForce(studio.id, "2025-06-01")?.id).toBe(v1.id);

    // Finish wear noticed ten months after delivery: inside v1's 12 months.
    const claim = getDb()
      .insert(claims)
      .values({ studioId: studio.id, pieceId: piece.id, ownerId: owner.id, category: "finish_wear", noticedOn: "2026-03-20", description: "Dull patch (invented).", answers: { heat: "no", chemicals: "no", impact: "no", usedOutdoors: "no" }, createdAt: new Date("2026-04-01T15:00:00Z") })
      .returning()
      .get();
    const before = coverageFor(piece.id, claim.id);
    expect(before.check?.line?.termMonths).toBe(12);
    expect(before.check?.daysLeft).toBeGreaterThan(0);

    // The studio shortens finish wear to 6 months from 2026-03-01.
    const v2 = createPolicyVersion(admin, terms("2026-03-01", 6), new Date("2026-03-01T15:00:00Z"));
    expect(v2.version).toBe(2);

    const after = coverageFor(piece.id, claim.id);
    expect(after).toEqual(before);
    expect(policyInForce(studio.id, "2025-06-01")?.id).toBe(v1.id);
    expect(policyInForce(studio.id, "2026-02-28")?.id).toBe(v1.id);
    expect(policyInForce(studio.id, "2026-03-01")?.id).toBe(v2.id);
    expect(policyInForce(studio.id, "2024-12-31")).toBeNull();

    // The same claim checked against v2 would come out differently, so the equality above means something.
    const v2Row = getDb().select().from(warrantyPolicies).where(eq(warrantyPolicies.id, v2.id)).get()!;
    getDb().update(pieces).set({ warrantyPolicyId: v2Row.id }).where(eq(pieces.id, piece.id)).run();
    const underV2 = coverageFor(piece.id, claim.id);
    expect(underV2.check?.line?.termMonths).toBe(6);
    expect(underV2.check?.daysLeft).toBeLessThan(0);
    expect(underV2.check?.suggestion).not.toBe(before.check?.suggestion);
    getDb().update(pieces).set({ warrantyPolicyId: v1.id }).where(eq(pieces.id, piece.id)).run();

    // A piece delivered after the change gets v2.
    const later = registryCreatePiece(staff, createPieceSchema.parse(pieceInput("2026-03-15"))).piece;
    expect(getDb().select({ w: pieces.warrantyPolicyId }).from(pieces).where(eq(pieces.id, later.id)).get()!.w).toBe(v2.id);

    const list = listPolicyVersions(admin, new Date("2026-03-02T15:00:00Z"));
    expect(list.map((v) => [v.version, v.current])).toEqual([
      [2, true],
      [1, false],
    ]);
    expect(list[0]!.changes).toEqual(["Finish wear, rings or marks: term 12 → 6 months."]);
  });

  it("versions only move forward, and only admins save them", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const staff = await memberContext(studio, "staff");
    const now = new Date("2026-05-10T15:00:00Z");
    createPolicyVersion(admin, terms("2026-06-01", 12), now);
    // Before the newest version's start: refused with the field named.
    const e1 = expectAppError(() => createPolicyVersion(admin, terms("2026-05-20", 12), now), 422);
    expect(e1.fieldErrors?.effectiveFrom?.[0]).toBe("The newest terms are for deliveries from 1 June 2026; start these on that day or later.");
    // The first version may start any day; later ones not before today.
    const studio2 = createStudio();
    const admin2 = await memberContext(studio2, "admin");
    createPolicyVersion(admin2, terms("2020-01-01", 12), now);
    const e2 = expectAppError(() => createPolicyVersion(admin2, terms("2026-05-09", 12), now), 422);
    expect(e2.fieldErrors?.effectiveFrom?.[0]).toBe("Start on 10 May 2026 (today) or later: pieces already delivered keep the terms they were delivered with.");
    expect(createPolicyVersion(admin2, terms("2026-05-10", 18), now).version).toBe(2);

    expectAppError(() => createPolicyVersion(staff, terms("2026-07-01", 12), now), 403);
    const none = terms("2026-07-01", 12);
    none.lines.finish_wear.covered = false;
    none.lines.structural.covered = false;
    expectAppError(() => createPolicyVersion(admin, none, now), 400);
    expect(() => createPolicyVersion(admin, policyVersionSchema.parse(terms("2026-07-01", 0)), now)).toThrow(ZodError);
    expect(() => createPolicyVersion(admin, policyVersionSchema.parse({ effectiveFrom: "2026-02-30", lines: terms("x", 12).lines }), now)).toThrow(ZodError);

    // Another studio neither sees nor gets these versions.
    expect(policyInForce(createStudio().id, "2027-01-01")).toBeNull();
    expect(policyEditorValues(admin, now).earliest).toBe("2026-06-01");
  });

  it("the editor's form and the stored policy convert both ways", () => {
    const input = terms("2026-01-01", 12);
    input.lines.finish_wear.careLogRequired = true;
    input.lines.finish_wear.graceDays = 45;
    input.lines.finish_wear.onMissed = "not_covered";
    const policy = formToPolicy(input, "v1");
    expect(Object.keys(policy.lines).sort()).toEqual(["finish_wear", "structural"]);
    expect(policy.lines.finish_wear).toEqual({ label: "Finish wear (invented terms)", termMonths: 12, exclusions: ["heat"], careLog: { graceDays: 45, onMissed: "not_covered" }, partlyCoveredPct: 50, transfersToNewOwner: true });
    expect(policy.lines.structural?.careLog).toBeUndefined();
    expect(formToPolicy(policyToForm(policy, "2026-01-01"), "v1")).toEqual(policy);
    expect(describePolicyChanges(policy, policy)).toEqual(["No changes to the terms."]);
    expect(describePolicyChanges(null, policy)).toEqual(["First version."]);
  });
});
