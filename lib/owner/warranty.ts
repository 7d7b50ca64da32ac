// Warranty lines as an owner sees them: each line of the piece's policy version, its term from the
// delivery date, the time left today, and whether it passed to this owner (transfersToNewOwner).
// Pure: used by the piece page, the API and the certificate PDF.
import type { WarrantyPolicy } from "@/lib/care/coverage";
import { addMonths, diffDays, type IsoDate } from "@/lib/care/dates";
import { CLAIM_CATEGORIES, type ClaimCategory } from "@/lib/care/vocabulary";

export type WarrantyLineStatus = "active" | "ended" | "not_transferred";

export type OwnerWarrantyLine = {
  category: ClaimCategory;
  label: string;
  termMonths: number;
  endsOn: IsoDate;
  /** Days left today; negative once the term has ended. */
  daysLeft: number;
  status: WarrantyLineStatus;
  transfersToNewOwner: boolean;
  exclusions: readonly string[];
  careLogRequired: boolean;
};

export function warrantyLinesFor(policy: WarrantyPolicy, deliveredOn: IsoDate, today: IsoDate, isOriginalOwner: boolean): OwnerWarrantyLine[] {
  const out: OwnerWarrantyLine[] = [];
  for (const category of CLAIM_CATEGORIES) {
    const line = policy.lines[category];
    if (!line) continue;
    const endsOn = addMonths(deliveredOn, line.termMonths);
    const daysLeft = diffDays(today, endsOn);
    const status: WarrantyLineStatus = !isOriginalOwner && !line.transfersToNewOwner ? "not_transferred" : daysLeft < 0 ? "ended" : "active";
    out.push({
      category,
      label: line.label,
      termMonths: line.termMonths,
      endsOn,
      daysLeft,
      status,
      transfersToNewOwner: line.transfersToNewOwner,
      exclusions: line.exclusions,
      careLogRequired: Boolean(line.careLog),
    });
  }
  return out;
}

export const WARRANTY_STATUS_LABELS: Record<WarrantyLineStatus, string> = {
  active: "In force",
  ended: "Term ended",
  not_transferred: "Stayed with the first owner",
};

export const EXCLUSION_LABELS: Record<string, string> = {
  heat: "heat damage",
  chemicals: "chemical damage",
  impact: "knocks and drops",
  outdoor_use_of_indoor_piece: "outdoor use of an indoor piece",
  direct_sun_on_indoor_resin: "direct sun on indoor resin",
};
