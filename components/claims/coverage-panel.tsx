import { CircleCheck, CircleHelp, CircleMinus, CircleX, type LucideIcon } from "lucide-react";
import type { ClaimCoverage } from "@/lib/claims/coverage";
import { Card } from "@/components/ui/card";

const SUGGESTION: Record<string, { label: string; Icon: LucideIcon; tone: string }> = {
  covered: { label: "Covered", Icon: CircleCheck, tone: "text-ok" },
  partly_covered: { label: "Partly covered", Icon: CircleMinus, tone: "text-warn" },
  not_covered: { label: "Not covered", Icon: CircleX, tone: "text-danger" },
  needs_info: { label: "Needs more information", Icon: CircleHelp, tone: "text-resin" },
};

/** The coverage check with every reason; staff decide, the suggestion is only a suggestion. */
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
            const s = SUGGESTION[c.suggestion]!;
            return (
              <p className={`flex items-center gap-2 text-lg font-semibold ${s.tone}`}>
                <s.Icon aria-hidden className="size-6" />
                Suggests: {s.label}
                {c.suggestedCoveredPct !== null ? <span className="text-base font-normal text-ink">({c.suggestedCoveredPct} % covered)</span> : null}
              </p>
            );
          })()}
          <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
            <dt className="text-muted">Warranty</dt>
            <dd>{coverage.policyVersion}</dd>
            <dt className="text-muted">Line</dt>
            <dd>{c.line ? `${c.line.label} (${c.line.termMonths} months)` : "none for this category"}</dd>
            {c.termEndsOn ? (
              <>
                <dt className="text-muted">Term</dt>
                <dd>
                  ends {c.termEndsOn} · {c.daysLeft! >= 0 ? `${c.daysLeft} days left at filing` : `expired ${-c.daysLeft!} days before filing`}
                </dd>
              </>
            ) : null}
            <dt className="text-muted">Care log</dt>
            <dd>{c.careLogCondition.replace("_", " ")}</dd>
          </dl>
          {c.climate?.reported ? (
            <div className="rounded-lg border border-line bg-paper p-3 text-sm">
              <p className="font-semibold">Seasonal movement of this slab</p>
              <p>
                {Math.abs(c.climate.reported.changeMm).toFixed(1)} mm ({Math.abs(c.climate.reported.changeIn).toFixed(2)} in) between the owner&apos;s driest and dampest readings;{" "}
                {c.climate.careGuide ? `${Math.abs(c.climate.careGuide.changeMm).toFixed(1)} mm across the care guide's 40–60 % RH.` : null}
              </p>
              <ul className="mt-1 list-disc pl-5 text-muted">
                {c.climate.reported.reasons.map((r) => (
                  <li key={r}>{r}</li>
                ))}
              </ul>
            </div>
          ) : null}
          <div>
            <p className="text-sm font-semibold">Every reason</p>
            <ol className="list-decimal space-y-1 pl-5 text-sm">
              {c.reasons.map((r, i) => (
                <li key={i}>{r}</li>
              ))}
            </ol>
          </div>
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
