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
  // An action name is a "<subject>.<what>" literal on a line that writes to the log: `action: "…"`,
  // either side of `action: x ? "…" : "…"`, or passed on to a helper that writes it (settleClaim in
  // lib/plans/refund.ts takes the action as an argument), under lib, app and jobs.
  const prefixes = new Set(Object.keys(AUDIT_ACTION_LABELS).map((a) => a.split(".")[0]!));
  const written = new Set(
    ["lib", "app", "jobs"]
      .flatMap(filesUnder)
      .flatMap((f) => fs.readFileSync(f, "utf8").split("\n"))
      .filter((line) => /\baction: |recordAudit\(|settleClaim\(/.test(line))
      .flatMap((line) => [
        ...[...line.matchAll(/\baction: "([a-z_]+\.[a-z_]+)"/g)].map((m) => m[1]!),
        ...[...line.matchAll(/"([a-z_]+)\.([a-z_]+)"/g)].filter((m) => prefixes.has(m[1]!)).map((m) => `${m[1]}.${m[2]}`),
      ]),
  );

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
