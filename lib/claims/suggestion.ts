// What a decision records beside itself (claims.suggestion, written by lib/claims/coverage.ts
// suggestionRecord): the coverage check's suggestion, its share and every reason, or why the check
// could not run. Type only, so db/schema.ts can type the column with it.
import type { CoverageCheck } from "@/lib/care/coverage";

type Always = { policyVersion: string; notes: string[] };

export type ClaimSuggestion =
  | (Always & { suggestion: null; error: string | null })
  | (Always & {
      suggestion: CoverageCheck["suggestion"];
      suggestedCoveredPct: number | null;
      /** The warranty line's label. */
      line: string | null;
      termEndsOn: CoverageCheck["termEndsOn"];
      exclusionsTriggered: CoverageCheck["exclusionsTriggered"];
      careLogCondition: CoverageCheck["careLogCondition"];
      reasons: string[];
      questions: string[];
    });
