// One open plan payment page per piece, across processes: plan checkouts for one piece started at the
// same moment from separate processes (each its own SQLite connection, as two server processes would
// be) leave one page that can take money. A start that finds another plan's page being opened is a 409
// with words; it doesn't wait for that page. Real SQLite file, the real stripe SDK against the local
// Stripe fake over HTTP. Invented studio, owner and piece.
import { execFile } from "node:child_process";
import path from "node:path";
import { promisify } from "node:util";
import { eq, isNotNull, and } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { planSubscriptions } from "@/db/schema";
import { addDays, localDate } from "@/lib/care/dates";
import { createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { monthlyPlan, plansStripeForFile, yearlyPlan } from "../support/plans-stripe";

const stripe = plansStripeForFile();
const run = promisify(execFile);

describe("plan checkouts for one piece started at once from separate processes", () => {
  it("leave one open payment page: every other start is refused with words or its page is closed", async () => {
    const studio = createStudio({ email: `${unique("checkout-race")}@test.example`, taxRateBp: 0 });
    const admin = await memberContext(studio, "admin");
    const owner = await createUser();
    const { piece } = createPiece(studio, { ownerId: owner.id, deliveredOn: addDays(localDate(new Date(), "UTC"), -60) });
    const yearly = yearlyPlan(admin, { refundRule: "none", transfers: false });
    const monthly = monthlyPlan(admin);
    const child = path.resolve("tests/integration/plans-checkout-concurrency.child.ts");
    const goAt = Date.now() + 6000; // every process is started and connected well before this
    const templates = [yearly.id, monthly.id, yearly.id];
    const results = await Promise.all(
      templates.map((t) =>
        run(process.execPath, ["--conditions=react-server", "--import", "tsx", child, owner.id, owner.email, owner.name, piece.id, t, String(goAt)], {
          env: { ...process.env, STRIPE_API_PORT: String(stripe.fake.port) },
          timeout: 60_000,
        }).then((r) => JSON.parse(r.stdout) as { status: number; url?: string; message?: string }),
      ),
    );
    expect(results.every((r) => r.status === 200 || r.status === 409), JSON.stringify(results)).toBe(true);
    for (const r of results.filter((x) => x.status === 409)) expect(r.message).toBe("A payment page for a care plan on this piece is being opened right now, in another tab or window. Finish there, or try again in a minute.");

    // At the payment service: one page of this piece's plans is open, and it is one a start handed out.
    const rows = getDb().select().from(planSubscriptions).where(eq(planSubscriptions.pieceId, piece.id)).all();
    const open = stripe.fake.sessions().filter((s) => s.status === "open" && rows.some((r) => r.id === s.client_reference_id));
    expect(open, JSON.stringify(results)).toHaveLength(1);
    expect(results.map((r) => r.url)).toContain(open[0]!.url);
    // In the database: one plan holds the piece's page, the one whose page is open.
    const claimed = getDb().select().from(planSubscriptions).where(and(eq(planSubscriptions.pieceId, piece.id), isNotNull(planSubscriptions.checkoutClaimedAt))).all();
    expect(claimed.map((r) => r.checkoutSessionId)).toEqual([open[0]!.id]);
  }, 90_000);
});
