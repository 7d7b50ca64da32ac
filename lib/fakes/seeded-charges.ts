// The demo seed's paid repair jobs (db/seed/jobs.ts and visits.ts: payment intents pi_demo_*) were
// never paid at the Stripe fake, which starts empty; the demo starts the fake knowing them as charges
// (lib/fakes/stripe-fake-cli.ts, STRIPE_FAKE_SEEDED_FROM), so staff can give money back on them there.
import Database from "better-sqlite3";
import type { FakeChargeSeed } from "./stripe-fake";

/** The seeded payments of the database file, as charges for the fake. */
export function seededCharges(dbFile: string): FakeChargeSeed[] {
  const db = new Database(dbFile, { readonly: true, fileMustExist: true });
  try {
    return db
      .prepare("SELECT payment_intent_id AS paymentIntent, amount_minor AS amount, currency, refunded_minor AS amountRefunded FROM payments WHERE payment_intent_id LIKE 'pi\\_demo\\_%' ESCAPE '\\'")
      .all() as FakeChargeSeed[];
  } finally {
    db.close();
  }
}
