import { describe, expect, it } from "vitest";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { describePolicyChanges, formToPolicy, policyToForm } from "@/lib/settings/policy";
import { policyVersionSchema } from "@/lib/validation/settings";

describe("warranty terms can exclude sun on resin (indoors or out)", () => {
  it("the default terms exclude sun on resin for clouding and yellowing", () => {
    expect(DEFAULT_WARRANTY_POLICY.lines.resin_clouding!.exclusions).toContain("sun_on_resin");
  });

  it("the terms editor's schema accepts it, and it survives form → terms → form", () => {
    const form = policyToForm(DEFAULT_WARRANTY_POLICY, "2026-12-02");
    const parsed = policyVersionSchema.safeParse(form);
    expect(parsed.success).toBe(true);
    const terms = formToPolicy(parsed.data!, "v2");
    expect(terms.lines.resin_clouding!.exclusions).toContain("sun_on_resin");
    expect(policyVersionSchema.safeParse({ ...form, lines: { ...form.lines, resin_clouding: { ...form.lines.resin_clouding, exclusions: ["moonlight"] } } }).success).toBe(false);
  });

  it("the change list names an added exclusion in words", () => {
    const before = { version: "v1", lines: { resin_clouding: { ...DEFAULT_WARRANTY_POLICY.lines.resin_clouding!, exclusions: ["heat" as const, "direct_sun_on_indoor_resin" as const] } } };
    const after = { version: "v2", lines: { resin_clouding: { ...DEFAULT_WARRANTY_POLICY.lines.resin_clouding!, exclusions: ["heat" as const, "sun_on_resin" as const] } } };
    const changes = describePolicyChanges(before, after);
    expect(changes.join("\n")).toMatch(/now excludes sun on resin, indoors or out/);
    expect(changes.join("\n")).toMatch(/no longer excludes direct sun on indoor resin/);
    expect(changes.join("\n")).not.toMatch(/sun_on_resin/);
  });
});
