// Proposing a quote's lines again over the lines it already has: staff's edits to a proposed line's
// quantity and unit price survive where the same work is proposed again. One rule for the server, which
// re-proposes over the lines last saved (lib/repairs/pricing priceJob), and for the quote builder, which
// lays the form's unsaved edits over what came back (components/jobs/quote-builder.tsx). No imports
// beyond types: the builder runs it in the browser.
import type { LineDraft } from "./lines";

/** A line before the proposal: what it was, and what had been proposed for it (null: nothing, a typed line). */
export type LineBefore = Pick<LineDraft, "ref" | "source" | "quantity" | "unitPriceMinor"> & { proposed?: { quantity: number; unitPriceMinor: number } | null };

/**
 * How a line of the new proposal came out against the line with its ref before: "kept" staff's own
 * quantity and price, "changed" by the proposal (its quantity or price differ from the line's before),
 * "same" as before, or "new" (no line had its ref).
 */
export type Reproposed = "kept" | "changed" | "same" | "new";

/** Staff changed a proposed line's quantity or unit price from what was proposed for it. */
export function editedByStaff(l: LineBefore): boolean {
  return l.source !== "typed" && l.proposed != null && (l.quantity !== l.proposed.quantity || l.unitPriceMinor !== l.proposed.unitPriceMinor);
}

/**
 * The new proposal's lines over the lines before, matched by ref: a line staff edited keeps their quantity
 * and unit price (its description, kind and unit are the proposal's); every other takes the proposal's. Only
 * the proposal's lines come back, in its order: proposed lines whose work is no longer proposed go, and
 * typed lines are the caller's to keep.
 */
export function reproposeLines<L extends LineDraft>(before: readonly LineBefore[], proposal: readonly L[]): { line: L; was: Reproposed; before: LineBefore | null }[] {
  return proposal.map((line) => {
    const prior = line.ref ? (before.find((b) => b.source !== "typed" && b.ref === line.ref) ?? null) : null;
    if (!prior) return { line, was: "new", before: null };
    if (editedByStaff(prior)) return { line: { ...line, quantity: prior.quantity, unitPriceMinor: prior.unitPriceMinor }, was: "kept", before: prior };
    return { line, was: prior.quantity !== line.quantity || prior.unitPriceMinor !== line.unitPriceMinor ? "changed" : "same", before: prior };
  });
}
