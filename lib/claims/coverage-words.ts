// The coverage check in words a front desk can read aloud: one summary line first,
// then each finding as a label; the engine's own reasons (equations, tables, sources) stay for the
// "How this was worked out" disclosure. Pure: the staff claim page and tests use it.
import type { CoverageCheck, CoverageSuggestion } from "@/lib/care/coverage";
import { formatDate, formatTimeLeft } from "@/lib/format";
import { exclusionLabel } from "@/lib/owner/warranty";

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

function list(items: string[]): string {
  return items.length <= 1 ? (items[0] ?? "") : `${items.slice(0, -1).join(", ")} and ${items.at(-1)}`;
}

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
      return `Suggested: partly covered (${c.suggestedCoveredPct} %) under ${line}${term}${why.length ? `, because ${list(why)}` : ""}.`;
    }
    case "needs_info":
      return `Suggested: ask the owner ${c.questions.length === 1 ? "one question" : `${c.questions.length} questions`} before deciding${line ? ` (${line})` : ""}.`;
    case "not_covered": {
      if (!c.line) return "Suggested: not covered — no line of the warranty terms covers this kind of damage.";
      if (c.daysLeft != null && c.daysLeft < 0) return `Suggested: not covered — ${line}${term}.`;
      if (c.exclusionsTriggered.length) return `Suggested: not covered — ${line} excludes ${list(c.exclusionsTriggered.map(exclusionLabel))}.`;
      if (c.careLogCondition === "missed") return `Suggested: not covered — ${line} asks for care to be logged when due, and it was not.`;
      return `Suggested: not covered under ${line}.`;
    }
  }
}
