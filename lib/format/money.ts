// Money, the one way it is written on pages, in e-mails and PDFs: by Intl for the studio's country
// (ECMA-402 NumberFormat, currency style; the symbol and its place come from Unicode CLDR):
// "$85.00" (US), "85,00 €" (DE, FR), "£85.00" (GB), "￥1,235" (JP) — never "85.00 USD". CSV exports
// keep machine-readable amounts (formatMinorUnits in lib/care/quote) beside a currency column.

/** The locale money is written in for a studio's country (ISO 3166-1 alpha-2): "US" → "en-US", "DE" → "de-DE". */
export function moneyLocale(country: string): string {
  try {
    const l = new Intl.Locale("und", { region: country }).maximize();
    return `${l.language}-${l.region}`;
  } catch {
    return "en-US";
  }
}

/** The currency's decimal places as Intl has them (ISO 4217): 2 for USD and EUR, 0 for JPY. */
export function currencyDigits(currency: string): number {
  return new Intl.NumberFormat("en", { style: "currency", currency }).resolvedOptions().maximumFractionDigits ?? 2;
}

/**
 * Money from integer minor units for the studio's country. The amount goes to Intl as an exact
 * decimal string, never as minor ÷ 100 in floating point.
 */
export function formatMoney(minor: number, currency: string, country = "US"): string {
  const exp = currencyDigits(currency);
  const sign = minor < 0 ? "-" : "";
  const digits = String(Math.abs(Math.trunc(minor))).padStart(exp + 1, "0");
  const decimal = exp === 0 ? digits : `${digits.slice(0, -exp)}.${digits.slice(-exp)}`;
  return new Intl.NumberFormat(moneyLocale(country), { style: "currency", currency }).format(`${sign}${decimal}` as `${number}`);
}

/** "8.25 %" from basis points (a tax rate), trailing zeros dropped: 2000 → "20 %". */
export function formatPercentBp(bp: number): string {
  return `${formatBasisPoints(bp)} %`;
}

/** Basis points as the percent a form field holds: 725 → "7.25", 1000 → "10", 0 → "0". */
export function formatBasisPoints(bp: number): string {
  return (bp / 100).toFixed(2).replace(/\.?0+$/, "") || "0";
}

/** A count in running text: "12,345". */
export function formatCount(n: number): string {
  return n.toLocaleString("en-US");
}
