// E-mails write lengths, areas, volumes and distances in the recipient's units
// through lib/owner/format. The care reminder is the mail that shows them (how much product, the top's
// area, a refresh offer's containers and travel); rendered here for a metric and an imperial owner.
// Exact factors: 1 US fl oz = 29.5735295625 mL; 1 ft² = 0.09290304 m²; 1 mi = 1.609344 km
// (NIST Handbook 44, Appendix C). Each expected figure is worked by hand in the comments.
import { render } from "@react-email/render";
import { describe, expect, it } from "vitest";
import { quote } from "@/lib/care/quote";
import { careSchedule, type CatalogEntry } from "@/lib/care/schedule";
import { offerView } from "@/lib/reminders/content";
import { composeReminder, type ReminderMail } from "@/lib/reminders/compose";

const oil: CatalogEntry = {
  id: "p-oil",
  name: "Example hardwax oil (invented)",
  finishClass: "hardwax_oil",
  coverageM2PerL: 20,
  containerSizesMl: [100, 500],
  containerPricesMinor: { 100: 1500, 500: 4500 },
};
const shape = { kind: "rectangle" as const, lengthMm: 2200, widthMm: 1000 };
const task = careSchedule({
  piece: { id: "piece-1", kind: "dining_table", use: "heavy", sun: "indirect", deliveredOn: "2025-03-02", resin: "none", shape },
  finishLayers: [{ id: "l1", surface: "top", finishClass: "hardwax_oil", productId: oil.id, coats: 2, appliedOn: "2025-03-02" }],
  careLog: [],
  catalog: [oil],
  now: "2025-04-01T12:00:00Z",
  timeZone: "UTC",
}).tasks.find((t) => t.kind === "reoil")!;

// 2.2 m² top, one coat at 20 m²/L: 110 mL exact; containers 2 × 100 mL (the least volume ≥ 110 mL).
const offerQuote = quote({
  tasks: ["reoil"],
  areaM2: 2.2,
  rates: { labourPerHourMinor: 8500 },
  products: [{ taskKind: "reoil", label: oil.name!, coverageM2PerL: 20, coats: 1, containerSizesMl: [100, 500], containerPricesMinor: { 100: 1500, 500: 4500 } }],
  travel: { distanceKm: 12, perKmMinor: 100 },
  taxRatePct: 0,
  coveredPct: 0,
  currency: "USD",
});

async function reminderText(unitSystem: "metric" | "imperial") {
  const mail: ReminderMail = {
    reminderKey: "k",
    step: "before_14d",
    task,
    owner: { id: "owner-1", email: "owner@owners.example", name: "Robin Example", unitSystem },
    piece: { id: "piece-1", title: "Oak table (invented)", use: "heavy", sun: "indirect", shape, hasResin: false },
    studio: { name: "Example Studio (invented)", country: "US" },
    product: oil,
    offer: { id: "offer-1", quote: offerQuote },
    ownerToday: "2025-06-01",
  };
  const input = composeReminder(mail);
  return [await render(input.email, { plainText: true }), await render(input.email)] as const;
}

describe("care reminder mail in the owner's units", () => {
  it("metric: mL, m² and km only", async () => {
    const [text, html] = await reminderText("metric");
    // 2200 × 1000 mm = 2.20 m².
    expect(text).toContain("How much: About 110 mL of Example hardwax oil (invented) for one coat on this top (2.20 m²) — 2 × 100 mL is enough.");
    expect(text).toContain("Example hardwax oil (invented), 100 mL × 2");
    expect(text).toContain("Travel, 12 km");
    for (const part of [text, html]) expect(part).not.toMatch(/fl oz|ft²|\bmi\b|\bin\b\s*[(×]/);
  });

  it("imperial: US fl oz with mL beside them, ft² and miles", async () => {
    const [text, html] = await reminderText("imperial");
    // 110 mL = 3.7195 fl oz → 3.8 (rounded up once); 2.2 m² = 23.680 ft² → 23.7; 100 mL = 3.3814 → 3.4 fl oz.
    expect(text).toContain("How much: About 3.8 US fl oz (110 mL) of Example hardwax oil (invented) for one coat on this top (23.7 ft²) — 2 × 3.4 US fl oz (100 mL) is enough.");
    expect(text).toContain("Example hardwax oil (invented), 3.4 US fl oz (100 mL) × 2");
    // 12 km = 12 / 1.609344 = 7.4565 mi → 7.5.
    expect(text).toContain("Travel, 7.5 mi");
    for (const part of [text, html]) expect(part).not.toMatch(/m²|\bkm\b/);
  });

  it("an offer stored before container sizes were kept reads as it was written", () => {
    const old = { ...offerQuote, lines: offerQuote.lines.map(({ product: _p, sizeMl: _s, ...l }) => l) };
    expect(offerView(old, "https://example.test/o", "imperial", "US").lines.map((l) => l.description)).toContain("Example hardwax oil (invented), 100 mL × 2");
  });
});
