// The coverage check in words a front desk can read aloud: one summary line first,
// then each finding as a label; the engine's own reasons (equations, tables, sources) stay for the
// "How this was worked out" disclosure. Pure: the staff claim page and tests use it.
import { CARE_GUIDE_CLIMATE, type CoverageCheck, type CoverageSuggestion, type RoomClimateReport } from "@/lib/care/coverage";
import type { IsoDate } from "@/lib/care/dates";
import { getSpecies } from "@/lib/care/species";
import { CARE_TASK_LABELS, type ClaimExclusion } from "@/lib/care/vocabulary";
import { formatAndList, formatDate, formatLength, formatTemperature, formatTemperatureChange, formatTimeLeft, type UnitSystem } from "@/lib/format";
import { exclusionLabel } from "@/lib/owner/warranty";
import type { PlanTermChange } from "@/lib/plans/coverage-terms";

export const SUGGESTION_LABELS: Record<CoverageSuggestion, string> = {
  covered: "Covered",
  partly_covered: "Partly covered",
  not_covered: "Not covered",
  needs_info: "Ask the owner first",
};

export const CARE_LOG_CONDITION_LABELS: Record<CoverageCheck["careLogCondition"], string> = {
  met: "Care was logged when it fell due",
  missed: "Care was not logged when it fell due",
  not_required: "This line does not ask for a care log",
  unknown: "Can't tell yet from the care log",
};

/** One sentence: the suggestion and the one or two facts that decide it. */
export function coverageSummary(c: CoverageCheck): string {
  const line = c.line ? `the “${c.line.label}” line` : null;
  const term = c.daysLeft == null ? "" : c.daysLeft >= 0 ? `, with ${formatTimeLeft(c.daysLeft)} of its term left when the claim was filed` : `, whose term ended ${formatDate(c.termEndsOn!)}, before the claim was filed`;
  switch (c.suggestion) {
    case "covered":
      return `Suggested: covered in full under ${line}${term}.`;
    case "partly_covered":
    {
      const why = [
        ...(c.careLogCondition === "missed" ? ["care was not logged when it fell due"] : []),
        ...(c.climate && !c.climate.insideCareGuide ? ["the room's climate was outside the care guide's range"] : []),
      ];
      return `Suggested: partly covered (${c.suggestedCoveredPct} %) under ${line}${term}${why.length ? `, because ${formatAndList(why)}` : ""}.`;
    }
    case "needs_info":
      return `Suggested: ask the owner ${c.questions.length === 1 ? "one question" : `${c.questions.length} questions`} before deciding${line ? ` (${line})` : ""}.`;
    case "not_covered": {
      if (!c.line) return "Suggested: not covered — no line of the warranty terms covers this kind of damage.";
      if (c.daysLeft != null && c.daysLeft < 0) return `Suggested: not covered — ${line}${term}.`;
      if (c.exclusionsTriggered.length) return `Suggested: not covered — ${line} excludes ${formatAndList(c.exclusionsTriggered.map(exclusionLabel))}.`;
      if (c.careLogCondition === "missed") return `Suggested: not covered — ${line} asks for care to be logged when due, and it was not.`;
      return `Suggested: not covered under ${line}.`;
    }
  }
}

/** What the lines of "How this was worked out" need beside the check: the piece's facts and the plan on the claim's day. */
export type CoverageFacts = {
  deliveredOn: IsoDate;
  room?: RoomClimateReport;
  widthMm?: number;
  units: UnitSystem;
  plan: { name: string; covers: boolean; lapsed: boolean; endedOn: string | null; changes: PlanTermChange[] } | null;
};

const OWNER_SAID: Record<ClaimExclusion, string> = {
  heat: "heat was near the damage",
  chemicals: "solvents, cleaners or alcohol touched the surface",
  impact: "the piece was knocked, dropped or hit",
  outdoor_use_of_indoor_piece: "the piece has been used outdoors",
  direct_sun_on_indoor_resin: "direct sun falls on the resin",
  sun_on_resin: "direct sun falls on the resin",
};

const months = (n: number) => `${n} month${n === 1 ? "" : "s"}`;
const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
/** Seasonal movement to 0.1 mm with inches beside it (or the other way round). */
function movement(mm: number, units: UnitSystem): string {
  const metric = `${Math.abs(mm).toFixed(1)} mm`;
  const imperial = `${Math.abs(mm / 25.4).toFixed(2)} in`;
  return units === "metric" ? `${metric} (${imperial})` : `${imperial} (${metric})`;
}

function planLines(plan: CoverageFacts["plan"]): string[] {
  if (!plan) return [];
  const name = `The care plan “${plan.name}”`;
  if (!plan.covers) return [`${name} ${plan.lapsed ? "lapsed" : "ended"}${plan.endedOn ? ` on ${plan.endedOn}` : ""}, before the claim, so the warranty's own terms apply.`];
  if (plan.changes.length === 0) return [`${name} was running when the claim was filed; it does not lengthen any warranty line.`];
  return plan.changes.map((ch) =>
    ch.fromMonths === null
      ? `${name} was running when the claim was filed and adds cover for ${ch.label.toLowerCase()}, ${months(ch.toMonths)} from delivery.`
      : `${name} was running when the claim was filed, so ${ch.label.toLowerCase()} is covered for ${months(ch.toMonths)} instead of ${months(ch.fromMonths)}.`,
  );
}

function climateLines(c: CoverageCheck, f: CoverageFacts): string[] {
  const room = f.room;
  if (!c.climate || !room) return [];
  const g = CARE_GUIDE_CLIMATE;
  const t = (v: number) => formatTemperature(v, f.units);
  const lines = [
    `The owner's room goes from ${room.driest.rhPct} % relative humidity at ${t(room.driest.tempC)} at its driest to ${room.dampest.rhPct} % at ${t(room.dampest.tempC)} at its dampest` +
      (room.largestDailyRhChangePct === undefined ? "" : `, changing up to ${room.largestDailyRhChangePct} % in a day`) +
      (room.largestDailyTempChangeC === undefined ? "" : `, and up to ${formatTemperatureChange(Math.abs(room.largestDailyTempChangeC), f.units)} in a day`) +
      ".",
    `The care guide for wood asks for ${g.rhMinPct}–${g.rhMaxPct} % relative humidity, changing no more than about ${g.maxDailyRhChangePct} % or ${formatTemperatureChange(g.maxDailyTempChangeC, f.units)} in a day; this room is ${c.climate.insideCareGuide ? "inside" : "outside"} it.`,
  ];
  const unknown = [room.largestDailyRhChangePct === undefined ? "humidity" : null, room.largestDailyTempChangeC === undefined ? "temperature" : null].filter(Boolean);
  if (unknown.length) lines.push(`The owner did not say how much the ${unknown.join(" or ")} changes within a day.`);
  for (const reading of [room.driest, room.dampest]) {
    if (reading.tempC < g.tempMinC || reading.tempC > g.tempMaxC) lines.push(`${capital(t(reading.tempC))} is outside the guide's ${t(g.tempMinC)} to ${t(g.tempMaxC)}.`);
  }
  const r = c.climate.reported;
  if (!r) lines.push("The seasonal movement could not be worked out: the piece record lacks a listed wood or the top's width.");
  else {
    const wood = getSpecies(r.speciesId)?.commonName.toLowerCase() ?? "the wood";
    const width = f.widthMm ? `${formatLength(f.widthMm, f.units)} wide ` : "";
    lines.push(
      `Between those two rooms this ${width}${wood} top should swell or shrink by about ${movement(r.changeMm, f.units)}` +
        (c.climate.careGuide ? `; across the care guide's range it would move ${movement(c.climate.careGuide.changeMm, f.units)}.` : "."),
    );
    if (r.temperatureClamped) lines.push("One reading is colder or hotter than the wood's moisture figures go, so the movement is approximate.");
  }
  lines.push(
    c.climate.insideCareGuide
      ? "The room stayed inside the care guide, so seasonal movement alone does not explain the damage."
      : "The room was outside the care guide, so movement beyond what the piece was built for may have played a part.",
  );
  return lines;
}

/**
 * "How this was worked out" on the staff claim page, in plain lines: the plan, the term with its dates
 * in words, the exclusions, the care log, the room and the slab's movement, then the suggestion. The
 * engine's own reasons (ISO dates, equations) stay in the stored suggestion record.
 */
export function coverageWorkedOut(c: CoverageCheck, f: CoverageFacts): string[] {
  const lines = planLines(f.plan);
  if (!c.line) return [...lines, "The warranty terms have no line for this kind of damage, so it is not covered."];
  const l = c.line;
  const span = `The “${l.label}” line runs ${months(l.termMonths)} from delivery on ${formatDate(f.deliveredOn)}, to ${formatDate(c.termEndsOn!)}`;
  const filed = `the claim was filed on ${formatDate(c.claimDate)}`;
  lines.push(c.daysLeft! >= 0 ? `${span}; ${filed}, with ${formatTimeLeft(c.daysLeft!)} left.` : `${span}; ${filed}, ${formatTimeLeft(-c.daysLeft!)} after that.`);
  if (c.notTransferred) lines.push("This line stays with the first owner, and the claim comes from a later owner.");
  for (const ex of c.exclusionsTriggered) {
    const why = c.excludedByRecord[ex] ?? `the owner said ${OWNER_SAID[ex]}`;
    lines.push(`${capital(why)}, and ${exclusionLabel(ex)} is excluded.`);
  }
  if (c.missedCare && l.careLog) {
    const m = c.missedCare;
    lines.push(
      `${CARE_TASK_LABELS[m.kind]} fell due on ${formatDate(m.dueOn)} (counted from the care on ${formatDate(m.lastCare)}), and none was logged within ${l.careLog.graceDays} days of it.`,
    );
  } else if (c.careLogCondition === "met" && l.careLog) lines.push(`Every refresh of the finish was logged within ${l.careLog.graceDays} days of falling due.`);
  else if (c.careLogCondition === "unknown") lines.push("The piece record has no finish layers yet, so the care log can't be checked.");
  lines.push(...climateLines(c, f));
  lines.push(
    c.suggestedCoveredPct === null
      ? "The check suggests asking the owner first; staff decide."
      : `The check suggests: ${SUGGESTION_LABELS[c.suggestion].toLowerCase()}${c.suggestion === "partly_covered" ? ` (${c.suggestedCoveredPct} %)` : ""}; staff decide.`,
  );
  return lines;
}
