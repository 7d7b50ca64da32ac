// Plan periods: one calendar year or month from an instant (UTC calendar arithmetic, as Stripe bills).

export function addPeriod(from: Date, interval: "year" | "month", times = 1): Date {
  const d = new Date(from.getTime());
  if (interval === "year") d.setUTCFullYear(d.getUTCFullYear() + times);
  else d.setUTCMonth(d.getUTCMonth() + times);
  return d;
}
