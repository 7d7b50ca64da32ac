// The payment page close pass: every payment page a release wrote down to be closed at Stripe and that
// Stripe didn't confirm at the time (lib/repairs/handed-on.ts closeDueCheckouts) is asked again, until
// Stripe confirms it, refuses it (asked no more) or the page has expired on its own, with a summary.
import { closeDueCheckouts } from "@/lib/repairs/handed-on";

export async function checkoutClosesJob(now: Date = new Date()): Promise<string[]> {
  const r = await closeDueCheckouts({ now });
  if (r.closed.length + r.expired.length + r.paid.length + r.refused.length + r.failed.length === 0) return [];
  return [
    ...r.closed.map((id) => `payment page close ${id}: closed at Stripe`),
    ...r.expired.map((id) => `payment page close ${id}: the page expired on its own`),
    ...r.paid.map((id) => `payment page close ${id}: the former owner paid first; the payment is refunded automatically`),
    ...r.refused.map((id) => `payment page close ${id}: refused by Stripe, not asked again (the audit log has its words)`),
    `payment page close pass: ${r.closed.length} closed, ${r.expired.length} expired, ${r.paid.length} paid first, ${r.refused.length} refused, ${r.failed.length} still waiting for the payment service`,
  ];
}
