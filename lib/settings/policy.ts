// Warranty policy versions. A version applies to pieces delivered on or after its
// effectiveFrom date; a piece keeps the version in force at its delivery (pieces.warrantyPolicyId is
// stamped when the piece is recorded). Versions only move forward: a new one starts no earlier than
// the newest one and no earlier than today, so "the newest version whose effectiveFrom ≤ delivery"
// is also the one with the latest effectiveFrom, and no already-stamped piece falls inside a new
// version's range. No server-only import: seeds and scripts use policyInForce too.
import { and, desc, eq, lte } from "drizzle-orm";
import { getDb, type Db } from "@/db/client";
import { warrantyPolicies, type WarrantyPolicyRow } from "@/db/schema";
import type { WarrantyLine, WarrantyPolicy } from "@/lib/care/coverage";
import { CLAIM_CATEGORIES, CLAIM_EXCLUSION_LABELS, type ClaimCategory, type ClaimExclusion } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS } from "@/lib/claims/labels";
import type { PolicyLineInput, PolicyVersionInput } from "@/lib/validation/settings";

type Reader = Pick<Db, "select">;

/**
 * The policy version in force for a piece delivered on `deliveredOn` (YYYY-MM-DD): the newest
 * version whose effectiveFrom is on or before that date, or null when the studio had none yet.
 */
export function policyInForce(studioId: string, deliveredOn: string, db: Reader = getDb()): WarrantyPolicyRow | null {
  return (
    db
      .select()
      .from(warrantyPolicies)
      .where(and(eq(warrantyPolicies.studioId, studioId), lte(warrantyPolicies.effectiveFrom, deliveredOn)))
      .orderBy(desc(warrantyPolicies.version))
      .get() ?? null
  );
}

/** What the editor shows for a category the policy does not cover (so ticking it starts sensibly). */
export function blankLine(category: ClaimCategory): PolicyLineInput {
  return {
    covered: false,
    label: CLAIM_CATEGORY_LABELS[category],
    termMonths: 12,
    exclusions: [],
    careLogRequired: false,
    graceDays: 60,
    onMissed: "partly_covered",
    climateCheck: false,
    partlyCoveredPct: 50,
    transfersToNewOwner: true,
  };
}

/** A stored policy as the editor's form values. */
export function policyToForm(policy: WarrantyPolicy | null, effectiveFrom: string): PolicyVersionInput {
  const lines = Object.fromEntries(
    CLAIM_CATEGORIES.map((c) => {
      const l = policy?.lines[c];
      if (!l) return [c, blankLine(c)];
      return [
        c,
        {
          covered: true,
          label: l.label,
          termMonths: l.termMonths,
          exclusions: [...l.exclusions],
          careLogRequired: Boolean(l.careLog),
          graceDays: l.careLog?.graceDays ?? 60,
          onMissed: l.careLog?.onMissed ?? "partly_covered",
          climateCheck: Boolean(l.climateCheck),
          partlyCoveredPct: l.partlyCoveredPct,
          transfersToNewOwner: l.transfersToNewOwner,
        } satisfies PolicyLineInput,
      ];
    }),
  ) as PolicyVersionInput["lines"];
  return { effectiveFrom, lines };
}

/** The editor's values as the care engine's WarrantyPolicy (only the covered lines). */
export function formToPolicy(input: PolicyVersionInput, versionLabel: string): WarrantyPolicy {
  const lines: Partial<Record<ClaimCategory, WarrantyLine>> = {};
  for (const c of CLAIM_CATEGORIES) {
    const l = input.lines[c];
    if (!l.covered) continue;
    lines[c] = {
      label: l.label,
      termMonths: l.termMonths,
      exclusions: [...new Set(l.exclusions)],
      ...(l.careLogRequired ? { careLog: { graceDays: l.graceDays, onMissed: l.onMissed } } : {}),
      ...(l.climateCheck ? { climateCheck: true } : {}),
      partlyCoveredPct: l.partlyCoveredPct,
      transfersToNewOwner: l.transfersToNewOwner,
    };
  }
  return { version: versionLabel, lines };
}

/** Plain-words differences between two versions, for the history list and the audit log. */
export function describePolicyChanges(before: WarrantyPolicy | null, after: WarrantyPolicy): string[] {
  if (!before) return ["First version."];
  const out: string[] = [];
  for (const c of CLAIM_CATEGORIES) {
    const a = before.lines[c];
    const b = after.lines[c];
    const name = CLAIM_CATEGORY_LABELS[c];
    if (!a && !b) continue;
    if (!a && b) {
      out.push(`${name}: now covered, ${b.termMonths} months.`);
      continue;
    }
    if (a && !b) {
      out.push(`${name}: no longer covered.`);
      continue;
    }
    if (!a || !b) continue;
    if (a.termMonths !== b.termMonths) out.push(`${name}: term ${a.termMonths} → ${b.termMonths} months.`);
    if (a.label !== b.label) out.push(`${name}: renamed “${a.label}” → “${b.label}”.`);
    const added = b.exclusions.filter((x) => !a.exclusions.includes(x));
    const removed = a.exclusions.filter((x) => !b.exclusions.includes(x));
    const words = (xs: readonly ClaimExclusion[]) => xs.map((x) => CLAIM_EXCLUSION_LABELS[x]?.toLowerCase() ?? x).join("; ");
    if (added.length) out.push(`${name}: now excludes ${words(added)}.`);
    if (removed.length) out.push(`${name}: no longer excludes ${words(removed)}.`);
    if (Boolean(a.careLog) !== Boolean(b.careLog)) out.push(`${name}: care-log condition ${b.careLog ? "added" : "removed"}.`);
    else if (a.careLog && b.careLog && (a.careLog.graceDays !== b.careLog.graceDays || a.careLog.onMissed !== b.careLog.onMissed)) out.push(`${name}: care-log condition changed.`);
    if (Boolean(a.climateCheck) !== Boolean(b.climateCheck)) out.push(`${name}: climate check ${b.climateCheck ? "added" : "removed"}.`);
    if (a.partlyCoveredPct !== b.partlyCoveredPct) out.push(`${name}: partly-covered share ${a.partlyCoveredPct} → ${b.partlyCoveredPct} %.`);
    if (a.transfersToNewOwner !== b.transfersToNewOwner) out.push(`${name}: ${b.transfersToNewOwner ? "now transfers" : "no longer transfers"} to a new owner.`);
  }
  return out.length ? out : ["No changes to the terms."];
}
