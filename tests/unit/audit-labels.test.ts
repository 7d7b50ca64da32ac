// Every action the product writes to the audit log with a fixed name has words a person reads in the
// studio's audit page (no "payment.refund_due" shown raw). Claim moves (`claim.<state>`) are labelled
// through the claim state labels.
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { CLAIM_STATE_LABELS_STAFF } from "@/lib/claims/labels";

function filesUnder(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    return e.isDirectory() ? (e.name === "fakes" ? [] : filesUnder(p)) : /\.tsx?$/.test(e.name) ? [p] : [];
  });
}

describe("audit labels", async () => {
  const { AUDIT_ACTION_LABELS, actionLabel } = await import("@/lib/studio/audit");
  const written = new Set(filesUnder("lib").concat(filesUnder("app")).flatMap((f) => [...fs.readFileSync(f, "utf8").matchAll(/\baction: "([a-z_]+\.[a-z_]+)"/g)].map((m) => m[1]!)));

  it("finds the actions the product writes", () => {
    expect(written.size).toBeGreaterThan(30);
  });

  it("every fixed action name has a label", () => {
    expect([...written].filter((a) => !AUDIT_ACTION_LABELS[a]).sort()).toEqual([]);
  });

  it("a care plan's move reads with the plan state labels, not their stored names", async () => {
    const { describe: describeEntry } = await import("@/lib/studio/audit");
    expect(describeEntry({ from: "awaiting_payment", to: "running" }, "USD", "plan.running")).toEqual(["Waiting for the first payment → Running"]);
  });

  it("a claim moved to any state reads with the staff's words for that state", () => {
    for (const [state, label] of Object.entries(CLAIM_STATE_LABELS_STAFF)) {
      const text = actionLabel(`claim.${state}`);
      expect(text).toContain(AUDIT_ACTION_LABELS[`claim.${state}`] ?? label);
      expect(text).not.toMatch(/_/);
    }
  });
});
