// Care plans offered in the hand-over and refresh mails, against a real SQLite file and the real SMTP
// sink: the mail lists the studio's plans that fit the piece (and none that don't), with what a plan
// would have saved over the last year of the owner's own care log — each logged task it includes,
// priced as the studio prices a visit doing it (lib/repairs priceJob), against a year of the plan with
// tax. That rule is the product's own (common practice, no published source). No log, no saving.
// Invented studios, owners and pieces; fixed instants, nothing reads the real clock.
import { DateTime } from "luxon";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { careLogEntries, finishProducts, warrantyPolicies, type Piece, type Studio } from "@/db/schema";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { formatMoney } from "@/lib/format";
import { deliverPiece } from "@/lib/pieces/handover-delivery";
import { planPrice } from "@/lib/plans/price";
import { createTemplate } from "@/lib/plans/templates";
import { planTemplateSchema } from "@/lib/plans/validation";
import { runReminderPass } from "@/lib/reminders/pass";
import { priceJob, pricedPiece } from "@/lib/repairs/pricing";
import { deliverPieceSchema } from "@/lib/validation/clients";
import { memberContext, unique } from "../support/fixtures";
import { getMail, listMail, waitForMail } from "../support/mail";
import { ownDatabaseFile, seedOwner, seedPiece, seedStudio } from "./reminders-helpers";

ownDatabaseFile("plans-offers");

const ZONE = "America/Denver";
/** The re-wax due day: a heavy-use waxed top is re-waxed every 6 months (lib/care/intervals.ts). */
const DUE = "2026-09-14";
const at10 = (date: string) => DateTime.fromISO(`${date}T10:00`, { zone: ZONE }).toJSDate();

const template = (over: Record<string, unknown>) =>
  planTemplateSchema.parse({
    name: "Wax keeping (invented)",
    included: { tasks: ["rewax"], visitsPerYear: 1, visitSharePct: 0, extendedLines: [{ category: "finish_wear", extraMonths: 12 }], repairDiscountPct: 10 },
    fits: { finishClasses: ["paste_wax"], pieceKinds: [], minTopAreaM2: null, maxTopAreaM2: null },
    priceMinor: 9_900,
    interval: "year",
    ...over,
  });

/** A studio (8.25 % tax on top) selling a plan for waxed tops and one for oiled tops. */
async function studioWithPlans() {
  const { studio, products } = seedStudio({ reminderSteps: ["due_day"], taxMode: "single", taxRateBp: 825, taxInclusive: false, email: `${unique("studio")}@test.example` });
  getDb().insert(warrantyPolicies).values({ studioId: studio.id, version: 1, effectiveFrom: "2024-01-01", policy: DEFAULT_WARRANTY_POLICY }).run();
  const admin = await memberContext(studio, "admin");
  const wax = createTemplate(admin, template({}));
  const oil = createTemplate(admin, template({ name: "Oil keeping (invented)", included: { tasks: ["reoil"], visitsPerYear: 1, visitSharePct: 0, extendedLines: [], repairDiscountPct: 0 }, fits: { finishClasses: ["hardwax_oil"], pieceKinds: [], minTopAreaM2: null, maxTopAreaM2: null } }));
  return { studio, products, admin, wax, oil };
}

/** What the studio charges for a one-off visit re-waxing this piece: the repair pricing, as a quote would be. */
function rewaxVisitMinor(studio: Studio, piece: Piece) {
  const products = getDb().select().from(finishProducts).all().filter((p) => p.studioId === studio.id);
  const wax = products.filter((p) => p.finishClass === "paste_wax").map((p) => p.id);
  return priceJob(studio, pricedPiece(getDb(), piece), { title: "Care visit", tasks: ["rewax"], repairs: [], productIds: wax.slice(0, 1), coats: 1, travel: true, coveredPct: 0, notes: "" }, products).totalMinor;
}

const money = (studio: Studio, minor: number) => formatMoney(minor, studio.currency, studio.country);
const refreshMailOf = async (to: string) => {
  const summary = (await listMail({ to })).find((m) => m.headers["x-grainward-offer"]);
  expect(summary, `a refresh-offer mail to ${to}`).toBeDefined();
  return getMail(summary!.id);
};

describe("the refresh-offer mail lists the plans that fit, with the owner's own last year", () => {
  it("prices the owner's logged re-waxing of the last 365 days against a year of the fitting plan; a charred top that no plan fits gets none", async () => {
    const { studio, products, admin, wax } = await studioWithPlans();
    const owner = seedOwner({ timeZone: ZONE });
    const piece = seedPiece(studio, owner.id, { deliveredOn: "2025-09-14", layers: [{ surface: "top", finishClass: "paste_wax", productId: products.wax, appliedOn: "2025-09-14" }] });
    const log = (userId: string, source: "owner" | "visit", doneOn: string) => getDb().insert(careLogEntries).values({ studioId: studio.id, pieceId: piece.id, userId, source, taskKind: "rewax", surface: "top", doneOn }).run();
    log(owner.id, "owner", "2025-10-20"); // in the last year
    log(owner.id, "owner", "2026-03-14"); // in the last year; re-wax now due 6 months on, on DUE
    log(owner.id, "owner", "2025-09-01"); // more than 365 days before DUE: not counted
    log(admin.user.id, "visit", "2025-12-01"); // the studio's own entry, not the owner's log: not counted

    const otherOwner = seedOwner({ timeZone: ZONE });
    seedPiece(studio, otherOwner.id, { deliveredOn: "2025-09-14", layers: [{ surface: "top", finishClass: "charred_oiled", productId: products.charred, appliedOn: "2025-09-14" }] });

    await runReminderPass({ now: at10(DUE) });

    const mail = await refreshMailOf(owner.email);
    expect(mail.text).toContain("Accept the refresh offer");
    const visit = rewaxVisitMinor(studio, piece);
    const year = planPrice(studio, wax);
    expect(year.totalMinor).toBe(10_717); // 9 900 + 8.25 % = 10 716.75, to the cent
    const saved = 2 * visit - year.totalMinor;
    expect(saved).toBeGreaterThan(0);
    expect(mail.text).toContain(`Wax keeping (invented) · ${money(studio, 10_717)} a year, including ${money(studio, 817)} tax`);
    expect(mail.text).toContain("Re-wax done by the studio");
    expect(mail.text).toContain("10 % off paid repairs");
    expect(mail.text).toContain(`The care you logged over the last year (2 tasks) would have cost ${money(studio, 2 * visit)} from ${studio.name}; a year of this plan is ${money(studio, 10_717)}, so it would have saved you ${money(studio, saved)}.`);
    expect(mail.text).not.toContain("Oil keeping");

    // Charred-and-oiled top: neither plan fits, so the offer goes without a plan section.
    const other = await refreshMailOf(otherOwner.email);
    expect(other.text).toContain("Accept the refresh offer");
    expect(other.text).not.toMatch(/care plan|keeping \(invented\)/i);
  });

  it("says nothing about savings when the owner logged nothing the plan includes", async () => {
    const { studio, products } = await studioWithPlans();
    const owner = seedOwner({ timeZone: ZONE });
    // Waxed six months before DUE, nothing logged since: the log has no re-waxing to price.
    seedPiece(studio, owner.id, { deliveredOn: "2026-03-14", layers: [{ surface: "top", finishClass: "paste_wax", productId: products.wax, appliedOn: "2026-03-14" }] });
    await runReminderPass({ now: at10(DUE) });
    const mail = await refreshMailOf(owner.email);
    expect(mail.text).toContain("Wax keeping (invented)");
    expect(mail.text).not.toContain("would have cost");
    expect(mail.text).not.toContain("saved");
  });
});

describe("the hand-over mail lists the plans that fit, without a saving (no care log yet)", () => {
  const delivery = (finishClass: "paste_wax" | "film_finish") =>
    deliverPieceSchema.parse({
      kind: "dining_table",
      title: `Ash table ${unique("t")} (invented)`,
      shapeKind: "rectangle",
      lengthMm: 1800,
      widthMm: 900,
      primarySpeciesId: "black_walnut",
      use: "heavy",
      deliveredOn: "2026-11-19",
      deliveryAddress: "9 Kiln Lane, Port Alder (invented)",
      layers: [{ surface: "top", finishClass, coats: 2, appliedOn: "2026-11-17", productLabel: "Shop finish (invented)" }],
      buyer: "new",
      buyerName: "Ida Brenner (invented)",
      buyerEmail: `${unique("ida")}@test.example`,
      buyerServiceMail: true,
    });

  it("names the waxed piece's plan with its price and what it includes; a film-finished piece's mail has none", async () => {
    const { studio, admin } = await studioWithPlans();
    const waxed = delivery("paste_wax");
    await deliverPiece(admin, waxed, new Date("2026-11-20T18:00:00Z"));
    const mail = await getMail((await waitForMail({ to: waxed.buyerEmail!, subject: /its care and warranty/ })).id);
    expect(mail.text).toContain(`Wax keeping (invented) · ${money(studio, 10_717)} a year, including ${money(studio, 817)} tax`);
    expect(mail.text).toContain("Finish wear, rings or marks: covered 12 months longer while the plan runs");
    expect(mail.text).toContain("Once the piece is registered, you can start a plan");
    expect(mail.text).not.toContain("Oil keeping");
    expect(mail.text).not.toContain("would have cost");

    const filmed = delivery("film_finish");
    await deliverPiece(admin, filmed, new Date("2026-11-20T18:00:00Z"));
    const plain = await getMail((await waitForMail({ to: filmed.buyerEmail!, subject: /its care and warranty/ })).id);
    expect(plain.text).toContain("Register my piece");
    expect(plain.text).not.toMatch(/care plan|keeping \(invented\)/i);
  });
});
