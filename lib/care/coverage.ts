import { topWidthMm } from "./area";
import { addMonths, assertTimeZone, diffDays, localDate, parseIsoDate, toEpochMs, type InstantInput, type IsoDate } from "./dates";
import { CareInputError } from "./errors";
import { slabMovement, type Climate, type SlabMovement } from "./movement";
import { dueDate, protectedByTopcoat, stackedLayerInterval, surfaceGroup, type CareFinishLayer, type CareLogEntry, type CarePiece, type CatalogEntry } from "./schedule";
import { getSpecies } from "./species";
import {
  CARE_TASK_LABELS,
  CLAIM_CATEGORIES,
  REFRESH_TASK_KINDS,
  TASK_KIND_BY_FINISH_CLASS,
  type CareTaskKind,
  type ClaimCategory,
  type ClaimExclusion,
} from "./vocabulary";

/**
 * The care guide's indoor climate for wooden objects: RH 40–60 %, changing at most about 5 % in 24 h,
 * 15–25 °C (Western Australian Museum, *Conservation and Care of Collections*, 2017, "Wood — preventive
 * conservation", listed in lib/care/SOURCES.md). The temperature change of at most about 4 °C in 24 h is the same
 * source's figure from memory: the printed excerpt we hold gives only the 15–25 °C range (lib/care/SOURCES.md).
 */
export const CARE_GUIDE_CLIMATE = { rhMinPct: 40, rhMaxPct: 60, maxDailyRhChangePct: 5, tempMinC: 15, tempMaxC: 25, maxDailyTempChangeC: 4 } as const;

export interface WarrantyLine {
  label: string;
  /** Term from the delivery date, calendar months. */
  termMonths: number;
  /** Exclusions this line honours; the owner's answers trigger them. */
  exclusions: readonly ClaimExclusion[];
  /** Condition: every refresh task of the piece was logged within graceDays of its due date. */
  careLog?: { graceDays: number; onMissed: "partly_covered" | "not_covered" };
  /** Compare the owner's room climate with the care guide and compute the slab's seasonal movement. */
  climateCheck?: boolean;
  /** Share suggested when the result is partly covered, %. */
  partlyCoveredPct: number;
  transfersToNewOwner: boolean;
}

export interface WarrantyPolicy {
  version: string;
  lines: Partial<Record<ClaimCategory, WarrantyLine>>;
}

/** Invented for the demo studio — not any real warranty. Studios write their own. */
export const DEFAULT_WARRANTY_POLICY: WarrantyPolicy = {
  version: "demo-2025-01 (invented)",
  lines: {
    crack_gap: {
      label: "Cracks, gaps and resin separation",
      termMonths: 24,
      exclusions: ["heat", "impact", "outdoor_use_of_indoor_piece"],
      climateCheck: true,
      partlyCoveredPct: 50,
      transfersToNewOwner: true,
    },
    resin_clouding: {
      label: "Resin clouding or yellowing",
      termMonths: 24,
      exclusions: ["heat", "chemicals", "outdoor_use_of_indoor_piece", "sun_on_resin"],
      partlyCoveredPct: 50,
      transfersToNewOwner: true,
    },
    finish_wear: {
      label: "Finish wear or rings",
      termMonths: 12,
      exclusions: ["heat", "chemicals", "impact", "outdoor_use_of_indoor_piece"],
      careLog: { graceDays: 60, onMissed: "partly_covered" },
      partlyCoveredPct: 50,
      transfersToNewOwner: false,
    },
    finish_peeling: {
      label: "Finish peeling",
      termMonths: 24,
      exclusions: ["heat", "chemicals", "outdoor_use_of_indoor_piece"],
      careLog: { graceDays: 60, onMissed: "partly_covered" },
      partlyCoveredPct: 50,
      transfersToNewOwner: true,
    },
    structural: {
      label: "Structure and joinery (wobble, loose joints)",
      termMonths: 60,
      exclusions: ["impact", "outdoor_use_of_indoor_piece"],
      partlyCoveredPct: 50,
      transfersToNewOwner: true,
    },
  },
};

/** The owner's answers on the claim form: true yes, false no, missing = not answered. */
export interface OwnerAnswers {
  /** Hot cookware, heaters, fireplaces near the damage. */
  heat?: boolean;
  /** Solvents, cleaning chemicals, alcohol spills. */
  chemicals?: boolean;
  impact?: boolean;
  usedOutdoors?: boolean;
  directSun?: boolean;
}

export interface RoomClimateReport {
  /** The driest and the dampest the room gets (e.g. winter heating and summer). */
  driest: Climate;
  dampest: Climate;
  /** Largest RH change within a day, percentage points, if known. */
  largestDailyRhChangePct?: number;
  /** Largest temperature change within a day, °C (a difference: °F × 5/9), if known. */
  largestDailyTempChangeC?: number;
}

export interface CoverageClaim {
  category: ClaimCategory;
  /** Date the claim is made (YYYY-MM-DD); default: today in the time zone. */
  filedOn?: IsoDate;
  answers: OwnerAnswers;
  roomClimate?: RoomClimateReport;
  /** false when the piece changed hands after delivery. Default true. */
  filedByOriginalOwner?: boolean;
}

export interface CoverageInput {
  claim: CoverageClaim;
  piece: CarePiece;
  policy: WarrantyPolicy;
  careLog: readonly CareLogEntry[];
  now: InstantInput;
  /** Needed for the care-log condition; without it the condition cannot be checked. */
  finishLayers?: readonly CareFinishLayer[];
  catalog?: readonly CatalogEntry[];
  timeZone?: string;
  /** Width across the grain, when the shape does not give it (measured tops). */
  widthMm?: number;
}

export type CoverageSuggestion = "covered" | "partly_covered" | "not_covered" | "needs_info";

export interface CoverageCheck {
  suggestion: CoverageSuggestion;
  line: ({ category: ClaimCategory } & WarrantyLine) | null;
  claimDate: IsoDate;
  termEndsOn: IsoDate | null;
  /** Days of term left on the claim date (negative: expired that many days ago); null with no line. */
  daysLeft: number | null;
  exclusionsTriggered: ClaimExclusion[];
  /** Exclusions the piece record answered, whatever the owner said, with why (words). */
  excludedByRecord: Partial<Record<ClaimExclusion, string>>;
  /** The line does not pass to a later owner, and a later owner filed the claim. */
  notTransferred: boolean;
  careLogCondition: "met" | "missed" | "not_required" | "unknown";
  /** The first care the log missed (its task, due date and the care before it), when the condition was missed. */
  missedCare: { kind: CareTaskKind; dueOn: IsoDate; lastCare: IsoDate } | null;
  climate: {
    insideCareGuide: boolean;
    reported?: SlabMovement;
    careGuide?: SlabMovement;
  } | null;
  /** 100, the line's partly share, 0, or null while info is missing. */
  suggestedCoveredPct: number | null;
  /** What to ask the owner (or fill in) before deciding. */
  questions: string[];
  reasons: string[];
}

const EXCLUSION_TEXT: Record<ClaimExclusion, { question: string; excluded: string }> = {
  heat: { question: "Was heat (hot cookware, a heater, a fireplace) near the damage?", excluded: "heat damage is excluded" },
  chemicals: { question: "Did solvents, cleaners or alcohol touch the surface?", excluded: "chemical damage is excluded" },
  impact: { question: "Was the piece knocked, dropped or hit?", excluded: "impact damage is excluded" },
  outdoor_use_of_indoor_piece: { question: "Has the piece been used outdoors?", excluded: "outdoor use of an indoor piece is excluded" },
  direct_sun_on_indoor_resin: { question: "Does direct sun fall on the resin?", excluded: "direct sun on the resin of an indoor piece is excluded" },
  sun_on_resin: {
    question: "Does direct sun fall on the resin?",
    excluded: "sun on the resin is excluded: resin yellows in daylight whatever the care",
  },
};

/**
 * Whether an exclusion applies to this piece, and the answer (undefined = not answered). `byRecord`:
 * the piece record answers it, whatever the owner said (sun_on_resin: an outdoor piece's resin is in
 * daylight, and so is resin the record places in direct sun).
 */
function exclusionAnswer(ex: ClaimExclusion, piece: CarePiece, a: OwnerAnswers): { applies: boolean; answer: boolean | undefined; byRecord?: string } {
  const indoor = piece.use !== "outdoor_covered";
  switch (ex) {
    case "heat":
      return { applies: true, answer: a.heat };
    case "chemicals":
      return { applies: true, answer: a.chemicals };
    case "impact":
      return { applies: true, answer: a.impact };
    case "outdoor_use_of_indoor_piece":
      return { applies: indoor, answer: a.usedOutdoors };
    case "direct_sun_on_indoor_resin":
      return { applies: indoor && piece.resin !== "none", answer: a.directSun };
    case "sun_on_resin":
      if (piece.resin === "none") return { applies: false, answer: undefined };
      if (!indoor) return { applies: true, answer: true, byRecord: "the piece is kept outdoors, so its resin is in daylight" };
      if (piece.sun === "direct") return { applies: true, answer: true, byRecord: "the piece record places it in direct sun" };
      return { applies: true, answer: a.directSun };
  }
}

/**
 * Walks each refresh clock of the piece from its first layer up to the claim date: the next care
 * (a care-log entry of the task's kind, or a new layer of the class) must come within graceDays after
 * each due date. Returns the first miss, or null.
 */
function firstMissedCare(
  piece: CarePiece,
  layers: readonly CareFinishLayer[],
  careLog: readonly CareLogEntry[],
  catalog: readonly CatalogEntry[],
  claimDate: IsoDate,
  graceDays: number,
): { kind: CareTaskKind; dueOn: IsoDate; lastCare: IsoDate } | null {
  const groups = new Map<string, CareFinishLayer[]>();
  for (const l of layers) {
    if (l.appliedOn > claimDate) continue;
    const k = `${surfaceGroup(l.surface)}|${l.finishClass}`;
    groups.set(k, [...(groups.get(k) ?? []), l]);
  }
  for (const [k, ls] of groups) {
    const [group, cls] = k.split("|") as ["top" | "base", CareFinishLayer["finishClass"]];
    const kind = TASK_KIND_BY_FINISH_CLASS[cls];
    if (!REFRESH_TASK_KINDS.includes(kind)) continue;
    const newestOf = (xs: readonly CareFinishLayer[] | undefined) => xs?.reduce((a, b) => (b.appliedOn >= a.appliedOn ? b : a));
    const newest = newestOf(ls)!;
    // The stacked-layer rule of careSchedule (schedule.ts, protectedByTopcoat).
    if (cls === "hardwax_oil" && protectedByTopcoat(newest, newestOf(groups.get(`${group}|ceramic_topcoat`)))) continue;
    const oil = cls === "ceramic_topcoat" ? newestOf(groups.get(`${group}|hardwax_oil`)) : undefined;
    const { interval } = stackedLayerInterval(piece, newest, oil && protectedByTopcoat(oil, newest) ? oil : undefined, catalog);
    const events = [
      ...ls.map((l) => l.appliedOn),
      ...careLog.filter((e) => e.taskKind === kind && e.doneOn <= claimDate && (!e.surface || surfaceGroup(e.surface) === group)).map((e) => e.doneOn),
    ].sort();
    let anchor = events[0]!;
    for (;;) {
      const due = dueDate(anchor, interval);
      const next = events.find((d) => d > anchor);
      const deadline = diffDays(due, claimDate) > graceDays ? due : null;
      if (next === undefined) {
        if (deadline) return { kind, dueOn: due, lastCare: anchor };
        break;
      }
      if (diffDays(due, next) > graceDays) return { kind, dueOn: due, lastCare: anchor };
      anchor = next;
    }
  }
  return null;
}

const mm = (n: number) => `${Math.abs(n).toFixed(1)} mm`;

/** The suggested coverage of a claim, with every reason. Staff decide. */
export function checkCoverage(input: CoverageInput): CoverageCheck {
  const { claim, piece, policy, careLog } = input;
  const timeZone = input.timeZone ?? "UTC";
  assertTimeZone(timeZone);
  if (!CLAIM_CATEGORIES.includes(claim?.category)) throw new CareInputError(`unknown claim category ${JSON.stringify(claim?.category)}`, "claim.category");
  parseIsoDate(piece.deliveredOn, "piece.deliveredOn");
  const claimDate = claim.filedOn ?? localDate(toEpochMs(input.now, "now"), timeZone);
  parseIsoDate(claimDate, "claim.filedOn");
  if (claimDate < piece.deliveredOn) throw new CareInputError(`claim date ${claimDate} is before delivery ${piece.deliveredOn}`, "claim.filedOn");

  const reasons: string[] = [];
  const questions: string[] = [];
  const base = { claimDate, exclusionsTriggered: [] as ClaimExclusion[], excludedByRecord: {}, notTransferred: false, missedCare: null, climate: null, questions, reasons };
  const lineDef = policy.lines[claim.category];
  if (!lineDef) {
    reasons.push(`the warranty (${policy.version}) has no line for ${claim.category.replace(/_/g, " ")}`);
    return { ...base, suggestion: "not_covered", line: null, termEndsOn: null, daysLeft: null, careLogCondition: "not_required", suggestedCoveredPct: 0 };
  }
  const line = { category: claim.category, ...lineDef };
  let blocked = false; // a not-covered reason was found
  let partly = false;

  const termEndsOn = addMonths(piece.deliveredOn, line.termMonths);
  const daysLeft = diffDays(claimDate, termEndsOn);
  if (daysLeft >= 0) reasons.push(`${line.label}: ${line.termMonths}-month term from delivery ${piece.deliveredOn} runs to ${termEndsOn}; ${daysLeft} days left on ${claimDate}`);
  else {
    blocked = true;
    reasons.push(`${line.label}: the ${line.termMonths}-month term from delivery ${piece.deliveredOn} ended ${termEndsOn}, ${-daysLeft} days before the claim`);
  }

  const notTransferred = claim.filedByOriginalOwner === false && !line.transfersToNewOwner;
  if (notTransferred) {
    blocked = true;
    reasons.push(`this line does not transfer to a new owner`);
  }

  const exclusionsTriggered: ClaimExclusion[] = [];
  const excludedByRecord: CoverageCheck["excludedByRecord"] = {};
  for (const ex of line.exclusions) {
    const { applies, answer, byRecord } = exclusionAnswer(ex, piece, claim.answers ?? {});
    if (!applies) continue;
    if (answer === true) {
      exclusionsTriggered.push(ex);
      if (byRecord) excludedByRecord[ex] = byRecord;
      blocked = true;
      reasons.push(`${byRecord ?? "owner answered yes"}: ${EXCLUSION_TEXT[ex].excluded}`);
    } else if (answer === undefined) questions.push(EXCLUSION_TEXT[ex].question);
  }

  let careLogCondition: CoverageCheck["careLogCondition"] = "not_required";
  let missedCare: CoverageCheck["missedCare"] = null;
  if (line.careLog) {
    if (!input.finishLayers || input.finishLayers.length === 0) {
      careLogCondition = "unknown";
      questions.push("Add the piece's finish stack so the care-log condition can be checked.");
    } else {
      const miss = firstMissedCare(piece, input.finishLayers, careLog, input.catalog ?? [], claimDate, line.careLog.graceDays);
      if (miss) {
        careLogCondition = "missed";
        missedCare = miss;
        reasons.push(
          `care-log condition missed: ${CARE_TASK_LABELS[miss.kind].toLowerCase()} was due ${miss.dueOn} (after care on ${miss.lastCare}) and was not logged within ${line.careLog.graceDays} days`,
        );
        if (line.careLog.onMissed === "not_covered") blocked = true;
        else partly = true;
      } else {
        careLogCondition = "met";
        reasons.push(`care-log condition met: every refresh was logged within ${line.careLog.graceDays} days of its due date`);
      }
    }
  }

  let climate: CoverageCheck["climate"] = null;
  if (line.climateCheck) {
    const rc = claim.roomClimate;
    if (!rc) questions.push("What are the room's driest and dampest conditions (temperature and relative humidity)?");
    else {
      const g = CARE_GUIDE_CLIMATE;
      const rhInside = [rc.driest.rhPct, rc.dampest.rhPct].every((rh) => rh >= g.rhMinPct && rh <= g.rhMaxPct);
      const swingOk = rc.largestDailyRhChangePct === undefined || rc.largestDailyRhChangePct <= g.maxDailyRhChangePct;
      const tempSwingOk = rc.largestDailyTempChangeC === undefined || Math.abs(rc.largestDailyTempChangeC) <= g.maxDailyTempChangeC;
      const insideCareGuide = rhInside && swingOk && tempSwingOk;
      climate = { insideCareGuide };
      reasons.push(
        `room ${rc.driest.rhPct}–${rc.dampest.rhPct} % RH` +
          (rc.largestDailyRhChangePct === undefined ? "" : `, up to ${rc.largestDailyRhChangePct} % in a day`) +
          (rc.largestDailyTempChangeC === undefined ? "" : `, temperature changing up to ${Math.abs(rc.largestDailyTempChangeC)} °C in a day`) +
          `; care guide ${g.rhMinPct}–${g.rhMaxPct} % RH, at most about ${g.maxDailyRhChangePct} % and ${g.maxDailyTempChangeC} °C a day (Western Australian Museum 2017): ` +
          (insideCareGuide ? "inside" : "outside"),
      );
      if (rc.largestDailyRhChangePct === undefined) reasons.push("daily humidity change not reported");
      if (rc.largestDailyTempChangeC === undefined) reasons.push("daily temperature change not reported");
      else if (!tempSwingOk) reasons.push(`the temperature changed more than about ${g.maxDailyTempChangeC} °C in a day, faster than the care guide allows`);
      if (piece.use === "outdoor_covered") reasons.push("this is an outdoor piece; the care guide describes an indoor room and is shown for comparison");
      for (const c of [rc.driest, rc.dampest]) {
        if (c.tempC < g.tempMinC || c.tempC > g.tempMaxC) reasons.push(`note: ${c.tempC} °C is outside the guide's ${g.tempMinC}–${g.tempMaxC} °C`);
      }
      const speciesId = piece.primarySpeciesId;
      const widthMm = input.widthMm ?? (piece.shape ? topWidthMm(piece.shape) : undefined);
      if (!speciesId || !getSpecies(speciesId) || !widthMm) {
        reasons.push("seasonal movement not computed: the piece record lacks a listed species or a width");
      } else {
        const grain = piece.grain ?? "flat";
        // Readings outside the EMC equation's 30–270 °F (a winter porch) are worked at the nearest bound, said in the reasons.
        const reported = slabMovement({ speciesId, widthMm, grain, from: rc.driest, to: rc.dampest, outOfRangeTemperature: "clamp" });
        const careGuide = slabMovement({
          speciesId,
          widthMm,
          grain,
          outOfRangeTemperature: "clamp",
          from: { tempC: rc.driest.tempC, rhPct: g.rhMinPct },
          to: { tempC: rc.dampest.tempC, rhPct: g.rhMaxPct },
        });
        climate.reported = reported;
        climate.careGuide = careGuide;
        reasons.push(
          `expected seasonal movement of this ${widthMm} mm top between the owner's rooms: ${mm(reported.changeMm)}; ` +
            `across the care guide's range it would be ${mm(careGuide.changeMm)}`,
        );
        reasons.push(...reported.reasons.slice(1)); // how it was worked out, and any clamped temperature
      }
      if (insideCareGuide) reasons.push("the room stayed inside the care guide, so seasonal movement alone does not explain the damage");
      else {
        partly = true;
        reasons.push("the room was outside the care guide; movement beyond what the piece was built for may have contributed");
      }
    }
  }

  let suggestion: CoverageSuggestion;
  if (blocked) suggestion = "not_covered";
  else if (questions.length > 0) suggestion = "needs_info";
  else if (partly) suggestion = "partly_covered";
  else suggestion = "covered";
  const suggestedCoveredPct = suggestion === "covered" ? 100 : suggestion === "partly_covered" ? line.partlyCoveredPct : suggestion === "not_covered" ? 0 : null;
  reasons.push(`suggestion: ${suggestion.replace("_", " ")}${suggestedCoveredPct === null ? " — answers needed" : ` (${suggestedCoveredPct} % covered)`}; staff decide`);
  return { suggestion, line, claimDate, termEndsOn, daysLeft, exclusionsTriggered, excludedByRecord, notTransferred, careLogCondition, missedCare, climate, suggestedCoveredPct, questions, reasons };
}
