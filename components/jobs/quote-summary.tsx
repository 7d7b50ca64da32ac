import type { QuoteLine } from "@/lib/care/quote";

const fmt = (minor: number, currency: string) => new Intl.NumberFormat("en-US", { style: "currency", currency }).format(minor / 10 ** (currency === "JPY" ? 0 : 2));

/** The quote's lines and totals, as the care engine computed them. */
export function QuoteSummary({ lines, currency, subtotalMinor, coveredMinor, coveredPct, taxMinor, totalMinor }: { lines: QuoteLine[]; currency: string; subtotalMinor: number; coveredMinor: number; coveredPct: number; taxMinor: number; totalMinor: number }) {
  return (
    <table className="w-full text-sm">
      <caption className="sr-only">Quote lines and totals</caption>
      <thead>
        <tr className="border-b border-line text-left text-muted">
          <th className="py-2 font-medium">Item</th>
          <th className="py-2 text-right font-medium">Amount</th>
        </tr>
      </thead>
      <tbody>
        {lines.map((l, i) => (
          <tr key={i} className="border-b border-line/60">
            <td className="py-2">
              {l.description}
              <span className="block text-xs text-muted">
                {l.quantity} {l.unit} × {fmt(l.unitPriceMinor, currency)}
              </span>
            </td>
            <td className="py-2 text-right tabular-nums">{fmt(l.amountMinor, currency)}</td>
          </tr>
        ))}
      </tbody>
      <tfoot>
        <tr>
          <td className="pt-3">Subtotal</td>
          <td className="pt-3 text-right tabular-nums">{fmt(subtotalMinor, currency)}</td>
        </tr>
        {coveredMinor ? (
          <tr>
            <td>Covered by the warranty ({coveredPct} %)</td>
            <td className="text-right tabular-nums">−{fmt(coveredMinor, currency)}</td>
          </tr>
        ) : null}
        <tr>
          <td>Tax</td>
          <td className="text-right tabular-nums">{fmt(taxMinor, currency)}</td>
        </tr>
        <tr className="text-base font-semibold">
          <td className="pt-2">To pay</td>
          <td className="pt-2 text-right tabular-nums">{fmt(totalMinor, currency)}</td>
        </tr>
      </tfoot>
    </table>
  );
}
