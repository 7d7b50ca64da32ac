// The payment page close pass: every payment page a release wrote down to be closed at Stripe and that
// Stripe didn't confirm at the time (lib/repairs/handed-on.ts closeDueCheckouts) is asked again, until
// Stripe confirms it or the page has expired on its own, with a summary.
import { closeDueCheckouts } from "@/lib/repairs/handed-on";

export async function checkoutClosesJob(now: Date = new Date()): Promise<string[]> {
  const r = await closeDueCheckouts({ now });
  if (r.closed.length + r.expired.length + r.failed.length === 0) return [];
  return [
    ...r.closed.map((id) => `payment page close ${id}: closed at Stripe`),
    ...r.expired.map((id) => `payment page close ${id}: the page expired on its own`),
    `payment page close pass: ${r.closed.length} closed, ${r.expired.length} expired, ${r.failed.length} still waiting for the payment service`,
  ];
}
