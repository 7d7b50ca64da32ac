import type { ClaimCoverage } from "@/lib/claims/coverage";
import { CARE_LOG_CONDITION_LABELS, coverageSummary, SUGGESTION_LABELS } from "@/lib/claims/coverage-words";
import { formatDate, formatTimeLeft } from "@/lib/format";
import { exclusionLabel } from "@/lib/owner/warranty";
import { Card } from "@/components/ui/card";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { SpriteIconName } from "@/components/ui/sprite-names";

const SUGGESTION_LOOK: Record<string, { icon: SpriteIconName; tone: string }> = {
  covered: { icon: "circle-check", tone: "text-ok" },
  partly_covered: { icon: "circle-minus", tone: "text-warn" },
  not_covered: { icon: "circle-x", tone: "text-danger" },
  needs_info: { icon: "circle-question-mark", tone: "text-resin" },
};

/**
 * The coverage check: a one-line summary a front desk can read aloud, the findings as labels, the
 * questions still to ask, and "How this was worked out" in plain lines (lib/claims/coverage-words; the
 * engine's own reasons, with their sources, stay in the stored suggestion). Staff decide.
 */
export function CoveragePanel({ coverage }: { coverage: ClaimCoverage }) {
  const c = coverage.check;
  return (
    <Card className="space-y-3" aria-labelledby="coverage-heading">
      <h2 id="coverage-heading" className="font-display text-xl font-semibold">
        Coverage check
      </h2>
      {!c ? (
        <p className="text-danger">{coverage.error}</p>
      ) : (
        <>
          {(() => {
            const look = SUGGESTION_LOOK[c.suggestion]!;
            return (
              <p className={`flex items-center gap-2 text-lg font-semibold ${look.tone}`}>
                <SpriteIcon name={look.icon} className="size-6 shrink-0" />
                {/* One flex item beside the icon, so the share wraps under the words instead of standing in a column of its own. */}
                <span data-testid="coverage-suggestion">
                  Suggests: {SUGGESTION_LABELS[c.suggestion]}
                  {c.suggestedCoveredPct !== null && c.suggestion === "partly_covered" ? <> <span className="whitespace-nowrap text-base font-normal text-ink">({c.suggestedCoveredPct} % covered)</span></> : null}
                </span>
              </p>
            );
          })()}
          <p data-testid="coverage-summary" className="text-base">
            {coverageSummary(c)}
          </p>
          <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
            <dt className="text-muted">Warranty terms</dt>
            <dd>{coverage.termsName}</dd>
            <dt className="text-muted">Line</dt>
            <dd>{c.line ? `${c.line.label} (${c.line.termMonths} months from delivery)` : "None for this kind of damage"}</dd>
            {c.termEndsOn ? (
              <>
                <dt className="text-muted">Term</dt>
                <dd>
                  Ends {formatDate(c.termEndsOn)} · {c.daysLeft! >= 0 ? `${formatTimeLeft(c.daysLeft!)} left when filed` : `ended ${formatTimeLeft(-c.daysLeft!)} before it was filed`}
                </dd>
              </>
            ) : null}
            {c.exclusionsTriggered.length ? (
              <>
                <dt className="text-muted">Excluded</dt>
                <dd>{c.exclusionsTriggered.map(exclusionLabel).join(", ")}</dd>
              </>
            ) : null}
            <dt className="text-muted">Care log</dt>
            <dd>{CARE_LOG_CONDITION_LABELS[c.careLogCondition]}</dd>
            {c.climate ? (
              <>
                <dt className="text-muted">Room climate</dt>
                <dd>{c.climate.insideCareGuide ? "Inside the care guide's range" : "Outside the care guide's range"}</dd>
              </>
            ) : null}
          </dl>
          {c.questions.length ? (
            <div>
              <p className="text-sm font-semibold">Still to ask the owner</p>
              <ul className="list-disc pl-5 text-sm">
                {c.questions.map((q) => (
                  <li key={q}>{q}</li>
                ))}
              </ul>
            </div>
          ) : null}
          <details className="rounded-lg border border-line bg-paper p-3 text-sm">
            <summary className="flex min-h-11 cursor-pointer items-center font-medium text-resin">How this was worked out</summary>
            <ol data-testid="coverage-worked-out" className="mt-2 list-decimal space-y-1 pl-5">
              {coverage.workedOut.map((line, i) => (
                <li key={i}>{line}</li>
              ))}
            </ol>
          </details>
        </>
      )}
      {coverage.notes.map((n) => (
        <p key={n} className="text-sm text-muted">
          Note: {n}
        </p>
      ))}
    </Card>
  );
}
