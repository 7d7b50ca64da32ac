// Advice that fits the piece: outdoor pieces get outdoor care, lines that
// cannot apply are not shown, a fresh layer says when it can be used, cautions fit the work, and owners
// read words rather than the engine's notation. Against a real SQLite file and the real SMTP sink.
import { eq } from "drizzle-orm";
import { render } from "@react-email/render";
import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { careLogEntries, finishLayers, warrantyPolicies } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { checkCoverage, DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { coverageSummary } from "@/lib/claims/coverage-words";
import { listAudit } from "@/lib/studio/audit";
import { auditQuerySchema } from "@/lib/studio/audit-query";
import { careSchedule } from "@/lib/care/schedule";
import { certificatePdf } from "@/lib/owner/certificate";
import { OWNER_TASK_STATE_WORDS, ownerTaskState } from "@/lib/owner/format";
import { getMyPiece } from "@/lib/owner/pieces";
import { renderDrawerCard } from "@/lib/pieces/card";
import { composeReminder } from "@/lib/reminders/compose";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { submitReport } from "@/lib/visits/report";
import { technicianDay } from "@/lib/visits/technician-day";
import { waitForMail } from "../support/mail";
import { createPiece, createProduct, createStudio, createUser, memberContext } from "../support/fixtures";
import { reportInput, staffActor, visitWorld } from "./visits-helpers";

const NOW = new Date("2026-03-15T18:00:00Z"); // 2026-03-15 in New York
const INDOOR_WORDS = /humidity|radiator|heater vent|coaster/i;

async function pdfText(pdf: Buffer): Promise<string> {
  const doc = await getDocument({ data: new Uint8Array(pdf), useSystemFonts: false, isEvalSupported: false, standardFontDataUrl: path.resolve("node_modules/pdfjs-dist/standard_fonts") + "/" }).promise;
  let text = "";
  for (let i = 1; i <= doc.numPages; i++) text += (await (await doc.getPage(i)).getTextContent()).items.map((it) => ("str" in it ? it.str : "")).join(" ") + "\n";
  return text.replace(/\s+/g, " ");
}

async function ownerWith(pieceOverrides: Parameters<typeof createPiece>[1], layers?: { finishClass: "hardwax_oil" | "charred_oiled" | "epoxy_surface" | "film_finish" | "ceramic_topcoat"; appliedOn: string; productId?: string }[]) {
  const studio = createStudio();
  const policy = getDb().insert(warrantyPolicies).values({ studioId: studio.id, version: 1, effectiveFrom: "2024-01-01", policy: DEFAULT_WARRANTY_POLICY }).returning().get();
  const me = await createUser({ emailVerifiedAt: new Date(), timeZone: "America/New_York", unitSystem: "metric", name: "Robin Example (invented)" });
  const { piece } = createPiece(studio, { ownerId: me.id, warrantyPolicyId: policy.id, registeredAt: new Date("2025-06-10T12:00:00Z"), ...pieceOverrides });
  if (layers) {
    getDb().delete(finishLayers).where(eq(finishLayers.pieceId, piece.id)).run();
    layers.forEach((l, i) =>
      getDb().insert(finishLayers).values({ studioId: studio.id, pieceId: piece.id, surface: "top", position: i, finishClass: l.finishClass, productId: l.productId ?? null, coats: 1, appliedOn: l.appliedOn }).run(),
    );
  }
  return { studio, me, piece };
}

describe("an outdoor piece gets outdoor care (item 8)", () => {
  it("no room humidity, radiators or coasters on its guide, card or reminders; outdoor placement instead", async () => {
    const { studio, me, piece } = await ownerWith({ kind: "bench", title: "Charred cedar bench (invented)", use: "outdoor_covered", primarySpeciesId: "western_redcedar", resinKind: "none" }, [
      { finishClass: "charred_oiled", appliedOn: "2025-06-01" },
    ]);
    const view = getMyPiece(me, piece.id, NOW);
    expect(view.guide.outdoor).toBe(true);
    expect(JSON.stringify(view.guide)).not.toMatch(INDOOR_WORDS);
    expect(view.guide.placement.join(" ")).toMatch(/puddles|rain/);
    expect(view.guide.annualCheck.join(" ")).toMatch(/water has sat/);

    const staff = await memberContext(studio, "staff");
    const card = await pdfText((await renderDrawerCard(staff, piece.id, "4x6", NOW)).pdf);
    expect(card).not.toMatch(INDOOR_WORDS);
    expect(card).toMatch(/puddles/);

    const schedule = careSchedule({
      piece: { id: piece.id, kind: "bench", use: "outdoor_covered", sun: "none", deliveredOn: "2025-06-01", resin: "none" },
      finishLayers: [{ id: "l", surface: "top", finishClass: "charred_oiled", coats: 1, appliedOn: "2025-06-01" }],
      careLog: [],
      catalog: [],
      now: NOW,
    });
    for (const task of schedule.tasks) {
      const mail = composeReminder({
        reminderKey: "k",
        step: "due_day",
        task,
        owner: { id: me.id, email: me.email, name: me.name, unitSystem: "metric" },
        piece: { id: piece.id, title: piece.title, use: "outdoor_covered", sun: "none", shape: undefined, hasResin: false },
        studio: { name: studio.name, country: studio.country },
        product: undefined,
        ownerToday: task.dueOn,
      });
      expect(await render(mail.email, { plainText: true })).not.toMatch(INDOOR_WORDS);
    }
  });

  it("an indoor piece keeps its room-climate advice", async () => {
    const { me, piece } = await ownerWith({ use: "heavy" });
    const view = getMyPiece(me, piece.id, NOW);
    expect(view.guide.outdoor).toBe(false);
    expect(view.guide.placement.join(" ")).toMatch(/40 and 60 % relative humidity/);
  });
});

describe("lines that cannot apply are not shown (item 8)", () => {
  it("a piece without resin has no resin warranty line or resin exclusion, on the page or the certificate", async () => {
    const { me, piece } = await ownerWith({ resinKind: "none" });
    const view = getMyPiece(me, piece.id, NOW);
    expect(view.warranty.lines.map((l) => l.category)).not.toContain("resin_clouding");
    expect(view.warranty.lines.length).toBeGreaterThan(0);
    expect(view.warranty.lines.flatMap((l) => l.exclusions).filter((e) => e.includes("resin"))).toEqual([]);
    expect(view.guide.cautions.map((c) => c.key)).not.toContain("heat_on_resin");
    const cert = await pdfText((await certificatePdf({ ...me, unitSystem: "metric" }, piece.id, NOW)).buffer);
    expect(cert).toContain("Warranty certificate");
    // The record's id is labelled as what it is for (it read "Certificate for piece <id>").
    expect(cert).toContain(`Studio record number ${piece.id}`);
    expect(cert).not.toMatch(/Resin clouding|on indoor resin/i);
  });

  it("a resin piece keeps its resin line; an outdoor piece has no 'outdoor use of an indoor piece' exclusion", async () => {
    const resin = await ownerWith({ resinKind: "deep_pour" });
    expect(getMyPiece(resin.me, resin.piece.id, NOW).warranty.lines.map((l) => l.category)).toContain("resin_clouding");
    const outdoor = await ownerWith({ use: "outdoor_covered", resinKind: "none" });
    const lines = getMyPiece(outdoor.me, outdoor.piece.id, NOW).warranty.lines;
    expect(lines.flatMap((l) => l.exclusions)).not.toContain("outdoor_use_of_indoor_piece");
  });
});

describe("cure times after a new layer (item 9)", () => {
  it("from the class default when the product has none: the page says until when to keep water off and when full use is fine", async () => {
    // Hardwax oil put on 2026-03-14: default 24 h to light use, 14 days to full use (lib/care/cure.ts, common practice).
    const { me, piece } = await ownerWith({ deliveredOn: "2026-03-14" }, [{ finishClass: "hardwax_oil", appliedOn: "2026-03-14" }]);
    const curing = getMyPiece(me, piece.id, NOW).guide.curing!;
    expect(curing.fullUseOn).toBe("2026-03-28");
    expect(curing.title).toContain("28 March 2026");
    expect(curing.lines[0]).toMatch(/light use is fine now/);
    expect(curing.lines[0]).toMatch(/children/);
    expect(curing.closing).toMatch(/tacky/);
  });

  it("from the catalog product's own cure time when it has one; nothing once the layer has cured", async () => {
    const studio = createStudio();
    const product = createProduct(studio, { name: "Slow oil (invented)", cureLightUseHours: 72, cureFullDays: 30 });
    const me = await createUser({ emailVerifiedAt: new Date(), timeZone: "America/New_York" });
    const { piece } = createPiece(studio, { ownerId: me.id, deliveredOn: "2026-03-14" });
    getDb().update(finishLayers).set({ productId: product.id, productLabel: product.name, appliedOn: "2026-03-14" }).where(eq(finishLayers.pieceId, piece.id)).run();
    const curing = getMyPiece(me, piece.id, NOW).guide.curing!;
    // 72 h → light use from 2026-03-17; 30 days → full use from 2026-04-13.
    expect(curing.lines[0]).toContain("Slow oil (invented)");
    expect(curing.lines[0]).toContain("until 17 March 2026");
    expect(curing.fullUseOn).toBe("2026-04-13");
    expect(getMyPiece(me, piece.id, new Date("2026-04-14T18:00:00Z")).guide.curing).toBeNull();
  });

  it("the drawer card printed at delivery says it too", async () => {
    const { studio, piece } = await ownerWith({ deliveredOn: "2026-03-14" }, [{ finishClass: "hardwax_oil", appliedOn: "2026-03-14" }]);
    const text = await pdfText((await renderDrawerCard(await memberContext(studio, "staff"), piece.id, "4x6", NOW)).pdf);
    expect(text).toMatch(/still curing/);
    expect(text).toContain("28 March 2026");
  });

  it("the visit-done mail says how long to keep water, objects and heavy use off the new coat", async () => {
    const w = await visitWorld();
    const slot = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-03T12:00:00Z", to: "2027-05-05T00:00:00Z" }, Date.parse("2027-04-26T12:00:00Z")).slots[0]!;
    const v = await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, Date.parse("2027-04-26T12:00:00Z"));
    const since = Date.now();
    await submitReport(w.tech, v.id, reportInput({ work: "One coat of oil on the top.", layers: [{ surface: "top", finishClass: "hardwax_oil", productId: w.product.id, coats: 1, appliedOn: slot.localDate }], signOffName: "T. Owner" }), new Date(Date.parse(slot.start) + 3_600_000));
    const mail = await waitForMail({ to: w.owner.email, subject: /^Visit report/, since });
    expect(mail.text).toMatch(/still curing/);
    expect(mail.text).toMatch(/keep water, mats, cloths and objects off it until/);
    expect(mail.text).toMatch(/fully cured/);
    expect(mail.text).not.toMatch(/whole_piece|\d{4}-\d{2}-\d{2}/);
  });
});

describe("cautions fit the work (item 10)", () => {
  it("a re-oil visit lists oily rags (detergent, sealed can, kept cool), ventilation, the label, lifting and electrics — each once — and no epoxy or resin-polishing caution", async () => {
    const w = await visitWorld();
    const slot = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-03T12:00:00Z", to: "2027-05-05T00:00:00Z" }, Date.parse("2027-04-26T12:00:00Z")).slots[0]!;
    await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, Date.parse("2027-04-26T12:00:00Z"));
    const cautions = technicianDay(w.tech, { date: slot.localDate }).items[0]!.cautions;
    const keys = cautions.map((c) => c.key);
    expect(keys).toEqual(["oily_rags", "fine_dust", "ventilation", "product_label", "heavy_top", "electrics"]);
    const rags = cautions[0]!.text;
    expect(rags).toMatch(/detergent/);
    expect(rags).toMatch(/close the lid tightly/);
    expect(rags).toMatch(/cool/);
    expect(cautions.find((c) => c.key === "fine_dust")!.text).toMatch(/mask rated for fine dust/);
    // No two lines say nearly the same thing: every title and every opening differs.
    expect(new Set(cautions.map((c) => c.text.slice(0, 40))).size).toBe(cautions.length);
  });

  it("a resin job lists epoxy skin contact (nitrile gloves) and polishing heat, and no oily rags", async () => {
    const w = await visitWorld();
    getDb().update(finishLayers).set({ finishClass: "epoxy_surface" }).where(eq(finishLayers.pieceId, w.piece.id)).run();
    const resinProduct = createProduct(w.studio, { name: "Tabletop epoxy (invented)", finishClass: "epoxy_surface", coverageM2PerL: 2 });
    const { addJob } = await import("./visits-helpers");
    const job = addJob(w.studio, w.piece.id, w.owner.id, resinProduct.id, "paid", ["resin_polish"]);
    const slot = listJobSlots(staffActor(w.staff), job.id, { from: "2027-05-03T12:00:00Z", to: "2027-05-05T00:00:00Z" }, Date.parse("2027-04-26T12:00:00Z")).slots[0]!;
    await bookVisit(staffActor(w.staff), { jobId: job.id, technicianId: slot.technicianId, start: slot.start }, Date.parse("2027-04-26T12:00:00Z"));
    const item = technicianDay(w.tech, { date: slot.localDate }).items.find((i) => i.job.id === job.id)!;
    const keys = item.cautions.map((c) => c.key);
    expect(keys).toContain("epoxy_skin");
    expect(keys).toContain("polishing_heat");
    expect(keys).not.toContain("oily_rags");
    expect(item.cautions.find((c) => c.key === "epoxy_skin")!.text).toMatch(/nitrile gloves/);
  });

  it("an owner of a resin piece is warned about hot mugs, laptops and heaters, not only pans", async () => {
    const { me, piece } = await ownerWith({ resinKind: "deep_pour" });
    const heat = getMyPiece(me, piece.id, NOW).guide.cautions.find((c) => c.key === "heat_on_resin")!;
    expect(heat.text).toMatch(/mugs/);
    expect(heat.text).toMatch(/laptop/);
    expect(heat.text).toMatch(/heaters/);
  });
});

describe("words for people (item 11)", () => {
  it("the owner's schedule has no engine notation: no 'mo', sources, ISO dates or enum values", async () => {
    const { me, piece } = await ownerWith({ sun: "direct" });
    const view = getMyPiece(me, piece.id, NOW);
    const words = JSON.stringify(view.schedule.tasks.map((t) => [t.interval, ...t.reasons]));
    expect(words).not.toMatch(/\bmo\b|from memory|common practice|no published source|Eq\.|whole_piece|\d{4}-\d{2}-\d{2}|×/);
    const reoil = view.schedule.tasks.find((t) => t.kind === "reoil")!;
    expect(reoil.interval).toBe("9 months"); // 12 months × 0.75 for direct sun (lib/care/intervals.ts)
    expect(reoil.reasons.join(" ")).toMatch(/in direct sun/);
  });
});

describe("the coverage check and the audit log in words (item 11)", () => {
  it("opens with one sentence a front desk can read aloud: no enum values, equations or sources", () => {
    const piece = { id: "p", kind: "dining_table", use: "heavy", sun: "none", deliveredOn: "2025-06-01", resin: "deep_pour", primarySpeciesId: "black_walnut", shape: { kind: "rectangle", lengthMm: 2000, widthMm: 1000 } } as const;
    const noAnswers = { heat: false, chemicals: false, impact: false, usedOutdoors: false, directSun: false };
    const crack = checkCoverage({
      claim: { category: "crack_gap", filedOn: "2026-03-01", answers: noAnswers, roomClimate: { driest: { tempC: 21, rhPct: 42 }, dampest: { tempC: 23, rhPct: 58 }, largestDailyRhChangePct: 4 } },
      piece,
      policy: DEFAULT_WARRANTY_POLICY,
      careLog: [],
      now: "2026-03-01T12:00:00Z",
    });
    const heat = checkCoverage({ claim: { category: "finish_wear", filedOn: "2026-03-01", answers: { ...noAnswers, heat: true } }, piece, policy: DEFAULT_WARRANTY_POLICY, careLog: [], now: "2026-03-01T12:00:00Z" });
    for (const c of [crack, heat]) {
      const line = coverageSummary(c);
      expect(line).toMatch(/^Suggested: /);
      expect(line).not.toMatch(/_|Eq\.|Table|from memory|common practice|\d{4}-\d{2}-\d{2}/);
    }
    const dry = checkCoverage({
      claim: { category: "crack_gap", filedOn: "2026-03-01", answers: noAnswers, roomClimate: { driest: { tempC: 22, rhPct: 20 }, dampest: { tempC: 24, rhPct: 65 } } },
      piece,
      policy: DEFAULT_WARRANTY_POLICY,
      careLog: [],
      now: "2026-03-01T12:00:00Z",
    });
    expect(dry.suggestion).toBe("partly_covered");
    expect(coverageSummary(dry)).toMatch(/^Suggested: partly covered \(\d+ %\) under the “Cracks, gaps and resin separation” line, with .* left when the claim was filed, because the room's climate was outside the care guide's range\.$/);
    expect(heat.suggestion).toBe("not_covered");
    expect(coverageSummary(heat)).toContain("excludes heat damage");
  });

  it("the audit log shows decisions, roles and amounts as words, not partly_covered or amountMinor: 10389", async () => {
    const studio = createStudio({ currency: "USD" });
    const staff = await memberContext(studio, "staff");
    getDb().transaction((tx) => {
      recordAudit(tx, { studioId: studio.id, actorId: staff.user.id, action: "claim.decided", subjectType: "claim", subjectId: "c1", data: { from: "in_review", to: "accepted", decision: "partly_covered", coveredPct: 60, suggestion: "partly_covered" } });
      recordAudit(tx, { studioId: studio.id, actorId: null, action: "job.paid", subjectType: "repair_job", subjectId: "j1", data: { amountMinor: 10389, quoteVersion: 1 } });
      recordAudit(tx, { studioId: studio.id, actorId: staff.user.id, action: "member.role_changed", subjectType: "user", subjectId: "u1", data: { from: "staff", to: "admin", role: "admin" } });
      recordAudit(tx, { studioId: studio.id, actorId: staff.user.id, action: "piece.registered", subjectType: "piece", subjectId: "p1", data: {} });
    });
    const log = listAudit(staff, auditQuerySchema.parse({}));
    const text = log.rows.map((r) => [r.label, ...r.details].join(" | ")).join("\n");
    expect(text).toContain("Decision: Partly covered");
    expect(text).toContain("Reviewing → Accepted");
    expect(text).toContain("Amount: $103.89");
    expect(text).toContain("Piece registered by its owner");
    expect(text).not.toMatch(/partly_covered|in_review|amountMinor|10389|piece\.registered|coveredPct/);
  });
});

describe("details an owner notices (item 13)", () => {
  it("task states say what to do: due in 22 days is 'Coming up', 13 months out is 'Nothing to do yet', whoever started the clock", () => {
    // The engine calls a cycle started by care "done" and one started by delivery "upcoming".
    expect(OWNER_TASK_STATE_WORDS[ownerTaskState("done", 22)]).toBe("Coming up: plan for it");
    expect(OWNER_TASK_STATE_WORDS[ownerTaskState("upcoming", 22)]).toBe("Coming up: plan for it");
    expect(OWNER_TASK_STATE_WORDS[ownerTaskState("upcoming", 395)]).toBe("Nothing to do yet");
    expect(OWNER_TASK_STATE_WORDS[ownerTaskState("done", 395)]).toBe("Nothing to do yet");
    expect(OWNER_TASK_STATE_WORDS[ownerTaskState("due", 10)]).toBe("Due: do it soon");
    expect(OWNER_TASK_STATE_WORDS[ownerTaskState("overdue", -3)]).toBe("Overdue: do it now");
  });

  it("the warranty bar shows the time left: it empties as the term runs out", async () => {
    const { me, piece } = await ownerWith({ deliveredOn: "2025-06-01" });
    const pct = (at: string) => getMyPiece(me, piece.id, new Date(at)).warranty.lines.find((l) => l.category === "structural")!.timeLeftPct;
    // Structure: 60 months from 2025-06-01 to 2030-06-01 (1826 days).
    expect(pct("2025-06-02T18:00:00Z")).toBe(100);
    expect(pct("2027-12-01T18:00:00Z")).toBe(50); // 913 of 1826 days left
    expect(pct("2030-05-01T18:00:00Z")).toBe(2); // 31 days left
  });

  it("care a technician did is counted from the studio visit, not 'your care log'", async () => {
    const { me, piece, studio } = await ownerWith({ deliveredOn: "2025-06-01" });
    getDb().insert(careLogEntries).values({ studioId: studio.id, pieceId: piece.id, userId: null, source: "visit", taskKind: "reoil", surface: "top", doneOn: "2026-02-01", notes: "" }).run();
    const view = getMyPiece(me, piece.id, NOW);
    const reoil = view.schedule.tasks.find((t) => t.kind === "reoil")!;
    expect(reoil.clockSource).toBe("care_log");
    expect(view.careLog[0]!.byLabel).toBe("At a studio visit");
    expect(reoil.reasons.join(" ")).not.toMatch(/You last logged/);
  });
});
