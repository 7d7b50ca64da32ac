import type { JobFigures } from "@/lib/repairs/figures";

/** The quote's lines and totals as stored on the job (lib/repairs/figures writes the amounts). */
export function QuoteSummary({ figures, totalLabel = "To pay", showProposed = false }: { figures: JobFigures; totalLabel?: string; showProposed?: boolean }) {
  const f = figures;
  return (
    <div className="space-y-2">
      <table className="w-full text-sm">
        <caption className="sr-only">Quote lines and totals</caption>
        <thead>
          <tr className="border-b border-line text-left text-muted">
            <th className="py-2 font-medium">Item</th>
            <th className="py-2 text-right font-medium">Amount</th>
          </tr>
        </thead>
        <tbody>
          {f.lines.map((l, i) => (
            <tr key={i} className="border-b border-line/60">
              <td className="py-2">
                {l.description}
                <span className="block text-xs text-muted">{l.quantityText}</span>
                {showProposed && l.proposedText ? <span className="block text-xs text-muted">Changed from the {l.proposedText}</span> : null}
              </td>
              <td className="py-2 text-right tabular-nums">{l.amount}</td>
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr>
            <td className="pt-3">Subtotal</td>
            <td className="pt-3 text-right tabular-nums">{f.text.subtotal}</td>
          </tr>
          {f.text.covered ? (
            <tr>
              <td>{f.coveredLabel}</td>
              <td className="text-right tabular-nums">{f.text.covered}</td>
            </tr>
          ) : null}
          {f.text.discount ? (
            <tr>
              <td>{f.discountLabel}</td>
              <td className="text-right tabular-nums">{f.text.discount}</td>
            </tr>
          ) : null}
          <tr>
            <td>Net</td>
            <td className="text-right tabular-nums">{f.text.net}</td>
          </tr>
          <tr>
            <td>{f.taxLabel}</td>
            <td className="text-right tabular-nums">{f.text.tax}</td>
          </tr>
          <tr className="text-base font-semibold">
            <td className="pt-2">{totalLabel}</td>
            <td className="pt-2 text-right tabular-nums">{f.text.total}</td>
          </tr>
        </tfoot>
      </table>
      {f.roundingNote ? <p className="text-xs text-muted">{f.roundingNote}</p> : null}
      {f.taxNumber ? <p className="text-xs text-muted">Tax number: {f.taxNumber}</p> : null}
    </div>
  );
}
