// The coverage check of a claim, from its rows: the one place claim rows become checkCoverage input.
// Rows become care-engine inputs through lib/pieces/care-inputs (toCarePiece, toCareLayers …).
import type { CareLogRow, Claim, FinishLayer, FinishProduct, Ownership, Piece, WarrantyPolicyRow } from "@/db/schema";
import { checkCoverage, DEFAULT_WARRANTY_POLICY, type CoverageCheck, type OwnerAnswers, type RoomClimateReport, type WarrantyPolicy } from "@/lib/care/coverage";
import { localDate } from "@/lib/care/dates";
import { CareInputError } from "@/lib/care/errors";
import { topWidthMm } from "@/lib/care/area";
import { formatDate, formatInstant, type UnitSystem } from "@/lib/format";
import { toCareLayers, toCareLog, toCarePiece, toCatalog } from "@/lib/pieces/care-inputs";
import { planOnDay, withPlanTerms, type PlanOnDay } from "@/lib/plans/coverage-terms";
import { claimAnswersSchema, type ClaimAnswers } from "@/lib/validation/claims";
import { coverageWorkedOut } from "./coverage-words";
import type { ClaimSuggestion } from "./suggestion";

/** The stored answers, read back through the same schema (rows written before a change fall back to "not sure"). */
export function readAnswers(stored: unknown): ClaimAnswers {
  const parsed = claimAnswersSchema.safeParse(stored);
  if (parsed.success) return parsed.data;
  return { heat: "unsure", chemicals: "unsure", impact: "unsure", usedOutdoors: "unsure", directSun: "unsure" };
}

export function ownerAnswers(a: ClaimAnswers): OwnerAnswers {
  const b = (v: ClaimAnswers["heat"]) => (v === "yes" ? true : v === "no" ? false : undefined);
  return { heat: b(a.heat), chemicals: b(a.chemicals), impact: b(a.impact), usedOutdoors: b(a.usedOutdoors), directSun: b(a.directSun) };
}

/** The owner's room readings (in °C: the answers schema stores them so), or undefined unless all four were given. */
export function roomClimate(a: ClaimAnswers): RoomClimateReport | undefined {
  const r = a.room;
  if (!r || r.driestTemp == null || r.driestRh == null || r.dampestTemp == null || r.dampestRh == null) return undefined;
  return {
    driest: { tempC: r.driestTemp, rhPct: r.driestRh },
    dampest: { tempC: r.dampestTemp, rhPct: r.dampestRh },
    ...(r.dailySwingPct != null ? { largestDailyRhChangePct: r.dailySwingPct } : {}),
    ...(r.dailyTempSwing != null ? { largestDailyTempChangeC: r.dailyTempSwing } : {}),
  };
}

export type ClaimCoverage = {
  check: CoverageCheck | null;
  /** "How this was worked out" in plain lines for staff (empty when the check could not run). */
  workedOut: string[];
  /** The warranty terms by name, with the care plan that lengthened them, in words. */
  termsName: string;
  /** Why the check could not run (bad piece record), shown instead of a suggestion. */
  error: string | null;
  policyVersion: string;
  notes: string[];
};

/** "Warranty terms for deliveries from 3 March 2026": a version of the studio's terms as its settings list them. */
export const warrantyTermsName = (effectiveFrom: string) => `Warranty terms for deliveries from ${formatDate(effectiveFrom)}`;

export function claimCoverage(input: {
  claim: Pick<Claim, "category" | "answers" | "createdAt" | "ownerId">;
  piece: Piece;
  layers: readonly FinishLayer[];
  careLog: readonly CareLogRow[];
  products: readonly FinishProduct[];
  policyRow: Pick<WarrantyPolicyRow, "policy" | "version" | "effectiveFrom"> | null;
  ownerships: readonly Pick<Ownership, "userId" | "startedAt">[];
  timeZone: string;
  /** The studio's units for the worked-out lines; metric when left out. */
  unitSystem?: UnitSystem;
  /** The care plan on the claim's day; read from the piece's plans when left out. */
  plan?: PlanOnDay | null;
}): ClaimCoverage {
  const notes: string[] = [];
  let policy: WarrantyPolicy;
  let termsName: string;
  // The terms are named as the studio's warranty settings name them, by the deliveries they apply from,
  // never by the label stored inside them (a version string, or the demo's "(invented)" id).
  if (input.policyRow) {
    policy = input.policyRow.policy;
    termsName = warrantyTermsName(input.policyRow.effectiveFrom);
  } else {
    policy = DEFAULT_WARRANTY_POLICY;
    termsName = "The standard terms";
    notes.push("This piece has no warranty terms on record, so it was checked against the standard terms.");
  }
  // A running care plan lengthens (or adds) warranty lines; from the day it lapsed or ended, the base terms apply.
  const plan = input.plan !== undefined ? input.plan : planOnDay(input.piece.id, input.claim.createdAt);
  const planTerms = plan ? withPlanTerms(policy, plan, input.timeZone) : null;
  if (planTerms) policy = planTerms.policy;
  if (plan?.covers) termsName += `, with the care plan “${plan.template.name}”`;
  const first = [...input.ownerships].sort((a, b) => a.startedAt.getTime() - b.startedAt.getTime())[0];
  const filedByOriginalOwner = first ? first.userId === input.claim.ownerId : true;
  if (!first) notes.push("No ownership history recorded; treated as filed by the original owner.");
  else if (!filedByOriginalOwner) notes.push("Filed by a later owner of the piece.");
  const answers = readAnswers(input.claim.answers);
  const roomClimateReport = roomClimate(answers);
  try {
    const check = checkCoverage({
      claim: {
        category: input.claim.category,
        filedOn: localDate(input.claim.createdAt, input.timeZone),
        answers: ownerAnswers(answers),
        roomClimate: roomClimateReport,
        filedByOriginalOwner,
      },
      piece: toCarePiece(input.piece),
      policy,
      careLog: toCareLog(input.careLog),
      finishLayers: toCareLayers(input.layers),
      catalog: toCatalog(input.products),
      now: input.claim.createdAt,
      timeZone: input.timeZone,
    });
    if (planTerms) check.reasons.unshift(...planTerms.reasons);
    const carePiece = toCarePiece(input.piece);
    const workedOut = coverageWorkedOut(check, {
      deliveredOn: input.piece.deliveredOn,
      room: roomClimateReport,
      widthMm: carePiece.shape ? topWidthMm(carePiece.shape) : undefined,
      units: input.unitSystem ?? "metric",
      plan: plan
        ? { name: plan.template.name, covers: plan.covers, lapsed: plan.sub.state === "lapsed", endedOn: plan.endedAt ? formatInstant(plan.endedAt, input.timeZone) : null, changes: planTerms?.changes ?? [] }
        : null,
    });
    return { check, workedOut, termsName, error: null, policyVersion: policy.version, notes };
  } catch (e) {
    if (e instanceof CareInputError) return { check: null, workedOut: [], termsName, error: couldNotRun(e, input.piece.deliveredOn), policyVersion: policy.version, notes };
    throw e;
  }
}

/** Why the check could not run, in words (the engine's message names fields and ISO dates). */
function couldNotRun(e: CareInputError, deliveredOn: string): string {
  if (e.field === "claim.filedOn") return `The coverage check could not run: the claim was filed before the piece's delivery on ${formatDate(deliveredOn)}. Check the delivery date on the piece record.`;
  if (e.field === "piece.deliveredOn") return "The coverage check could not run: the piece record's delivery date is not a date. Correct it on the piece record.";
  return `The coverage check could not run: ${e.message}.`;
}

/** What a decision records beside itself: the suggestion, its share and every reason. */
export function suggestionRecord(c: ClaimCoverage): ClaimSuggestion {
  if (!c.check) return { suggestion: null, error: c.error, policyVersion: c.policyVersion, notes: c.notes };
  return {
    suggestion: c.check.suggestion,
    suggestedCoveredPct: c.check.suggestedCoveredPct,
    line: c.check.line?.label ?? null,
    termEndsOn: c.check.termEndsOn,
    exclusionsTriggered: c.check.exclusionsTriggered,
    careLogCondition: c.check.careLogCondition,
    reasons: c.check.reasons,
    questions: c.check.questions,
    policyVersion: c.policyVersion,
    notes: c.notes,
  };
}
