// The shared date helper (lib/validation/dates.ts) in every schema that takes a date a person enters,
// and the PATCH pattern (lib/validation/patch.ts): a field a PATCH does not send stays absent.
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { CareInputError } from "@/lib/care/errors";
import { addDays } from "@/lib/care/dates";
import { claimRatesQuerySchema } from "@/lib/reports/query";
import { auditQuerySchema } from "@/lib/studio/audit-query";
import { asAppError } from "@/lib/validation/care-input";
import * as claimsSchemas from "@/lib/validation/claims";
import { filterDate, pastDate, policyDate, utcToday, visitDay } from "@/lib/validation/dates";
import * as jobsSchemas from "@/lib/validation/jobs";
import * as ownerSchemas from "@/lib/validation/owner";
import * as piecesSchemas from "@/lib/validation/pieces";
import * as remindersSchemas from "@/lib/validation/reminders";
import * as settingsSchemas from "@/lib/validation/settings";
import * as visitsSchemas from "@/lib/validation/visits";
import { inWords } from "@/lib/validation/words";

// Schemas with no words of their own, for the error map's cases.
const inWordsSchemas = {
  one: z.enum(["a"]),
  n: z.number().positive().max(1000),
  obj: z.object({ name: z.string() }),
  s: z.string().min(1).max(10),
  list: z.array(z.number()).max(2),
  email: z.email(),
  strict: z.strictObject({ a: z.number() }),
};

const issues = (r: { success: boolean; error?: z.ZodError }) => (r.success ? [] : r.error!.issues.map((i) => `${i.path.join(".")}: ${i.message}`));

describe("date ranges", () => {
  it("a past date (delivery, care, notice) is 1900 to tomorrow", () => {
    const past = pastDate();
    expect(past.safeParse("2020-02-29").success).toBe(true);
    expect(past.safeParse("1900-01-01").success).toBe(true);
    expect(past.safeParse(addDays(utcToday(), 1)).success).toBe(true);
    expect(issues(past.safeParse(addDays(utcToday(), 2)))[0]).toMatch(/future/);
    expect(issues(past.safeParse("9999-12-31"))[0]).toMatch(/future/);
    expect(issues(past.safeParse("1899-12-31"))[0]).toMatch(/1900/);
    expect(issues(past.safeParse("0001-01-01"))[0]).toMatch(/1900/);
    expect(issues(past.safeParse("2021-02-29"))[0]).toMatch(/doesn't exist/);
  });

  it("a policy date is within ten years back and two ahead; a visit day within a year back and two ahead; a filter date 1900-2199", () => {
    expect(policyDate().safeParse(utcToday()).success).toBe(true);
    expect(policyDate().safeParse("9999-12-31").success).toBe(false);
    expect(policyDate().safeParse("1990-01-01").success).toBe(false);
    expect(visitDay().safeParse(addDays(utcToday(), 30)).success).toBe(true);
    expect(visitDay().safeParse("9999-12-31").success).toBe(false);
    // Past weeks stay readable (no lower bound that moves with the clock and would age a test out).
    expect(visitDay().safeParse("2020-03-02").success).toBe(true);
    expect(visitsSchemas.listVisitsQuerySchema.safeParse({ from: "2020-03-02T00:00:00Z", to: "2020-03-09T00:00:00Z" }).success).toBe(true);
    expect(visitsSchemas.listVisitsQuerySchema.safeParse({ from: "1899-03-02T00:00:00Z", to: "1899-03-09T00:00:00Z" }).success).toBe(false);
    expect(filterDate().safeParse("2150-06-01").success).toBe(true);
    expect(filterDate().safeParse("9999-12-31").success).toBe(false);
  });

  it("every schema that takes a date refuses 9999-12-31 with a field error", () => {
    const piece = { kind: "dining_table", title: "Invented table", shapeKind: "rectangle", lengthMm: 2000, widthMm: 900, primarySpeciesId: "black_walnut", use: "heavy", deliveredOn: "9999-12-31" };
    expect(issues(piecesSchemas.pieceSchema.safeParse(piece))).toEqual([expect.stringMatching(/^deliveredOn: .*future/)]);
    expect(issues(piecesSchemas.piecePatchSchema.safeParse({ resinPouredOn: "9999-12-31" }))).toEqual([expect.stringMatching(/^resinPouredOn:/)]);
    expect(issues(piecesSchemas.layerSchema.safeParse({ surface: "top", finishClass: "hardwax_oil", coats: 1, appliedOn: "9999-12-31" }))).toEqual([expect.stringMatching(/^appliedOn:/)]);
    expect(issues(ownerSchemas.careLogSchema.safeParse({ taskKind: "reoil", surface: "top", doneOn: "9999-12-31" }))).toEqual([expect.stringMatching(/^doneOn:/)]);
    expect(issues(claimsSchemas.createClaimSchema.safeParse({ noticedOn: "9999-12-31" })).some((i) => i.startsWith("noticedOn:"))).toBe(true);
    expect(issues(settingsSchemas.policyVersionSchema.safeParse({ effectiveFrom: "9999-12-31", lines: {} })).some((i) => i.startsWith("effectiveFrom:"))).toBe(true);
    expect(issues(visitsSchemas.technicianHoursSchema.safeParse({ hours: [], timeOff: [{ date: "9999-12-31" }] }))).toEqual([expect.stringMatching(/^timeOff\.0\.date:/)]);
    expect(issues(visitsSchemas.bookVisitSchema.safeParse({ jobId: "j", technicianId: "t", start: "9999-12-31T10:00:00Z" }))).toEqual([expect.stringMatching(/^start:/)]);
    expect(issues(visitsSchemas.listVisitsQuerySchema.safeParse({ from: "9999-12-20T00:00:00Z", to: "9999-12-31T00:00:00Z" })).some((i) => i.startsWith("from:"))).toBe(true);
    expect(issues(visitsSchemas.visitReportSchema.safeParse({ work: "Oiled", signOffName: "Invented Owner", layers: [{ surface: "top", finishClass: "hardwax_oil", coats: 1, appliedOn: "9999-12-31" }] }))).toEqual([expect.stringMatching(/^layers\.0\.appliedOn:/)]);
    expect(issues(auditQuerySchema.safeParse({ to: "9999-12-31" }))).toEqual([expect.stringMatching(/^to:/)]);
    expect(issues(claimRatesQuerySchema.safeParse({ to: "9999-12-31" }))).toEqual([expect.stringMatching(/^to:/)]);
  });

  it("the care engine's own input error is a 400 with plain words, never a 500", () => {
    const e = asAppError(new CareInputError('date must be a date like 2025-03-02, got "10000-01-01"', "date"));
    expect(e?.status).toBe(400);
    expect(e?.code).toBe("out_of_range");
    expect(e?.message).not.toMatch(/10000|must be/);
    expect(asAppError(new Error("boom"))).toBeUndefined();
  });
});

describe("PATCH schemas", () => {
  const modules = { claimsSchemas, jobsSchemas, ownerSchemas, piecesSchemas, remindersSchemas, settingsSchemas, visitsSchemas };
  const patches = Object.values(modules).flatMap((m) => Object.entries(m).filter(([name]) => /PatchSchema$/.test(name))) as [string, z.ZodType][];

  it("finds the PATCH schemas", () => {
    expect(patches.map(([n]) => n).sort()).toEqual(expect.arrayContaining(["careLogPatchSchema", "catalogPatchSchema", "layerPatchSchema", "piecePatchSchema", "preferencesPatchSchema"]));
  });

  it.each(patches)("%s fills in nothing that was not sent", (_name, schema) => {
    const r = schema.safeParse({});
    // Either "nothing to change", or nothing at all: never a default standing in for an absent field.
    if (r.success) expect(r.data).toEqual({});
  });

  it("a care-log PATCH of the date alone is the date alone", () => {
    expect(ownerSchemas.careLogPatchSchema.parse({ doneOn: "2026-03-08" })).toEqual({ doneOn: "2026-03-08" });
    expect(ownerSchemas.preferencesPatchSchema.parse({ unitSystem: "imperial" })).toEqual({ unitSystem: "imperial" });
  });
});

describe("out-of-range values a person types read in words", () => {
  // zod's built-in messages ("Too big: expected number to be <=100") are machine sentences; every field
  // a person fills carries its own. Each case: the schema, a value past its bound, the field, the words.
  const zodDefault = /^(Too (big|small)|Invalid|Expected|expected)/;
  const cases: [string, z.ZodType, unknown, string, RegExp][] = [
    ["warranty share over 100 %", jobsSchemas.jobQuoteSchema, { title: "Fix", tasks: ["annual_check"], productIds: [], coats: 1, travel: false, coveredPct: 250 }, "coveredPct", /0 to 100 %/],
    ["warranty share not a number", jobsSchemas.jobQuoteSchema, { title: "Fix", tasks: ["annual_check"], productIds: [], coats: 1, travel: false, coveredPct: "lots" }, "coveredPct", /number from 0 to 100/],
    ["job title of 161 characters", jobsSchemas.jobQuoteSchema, { title: "x".repeat(161), tasks: ["annual_check"], productIds: [], coats: 1, travel: false, coveredPct: 0 }, "title", /160 characters/],
    ["catalog interval of 241 months", piecesSchemas.catalogProductSchema, { name: "Oil", finishClass: "hardwax_oil", coverageM2PerL: 10, intervalHeavyMonths: 241 }, "intervalHeavyMonths", /240 months/],
    ["catalog container of 200 L", piecesSchemas.catalogProductSchema, { name: "Oil", finishClass: "hardwax_oil", coverageM2PerL: 10, containers: [{ ml: 200_000, priceMinor: 100 }] }, "containers.0.ml", /100,000 mL/],
    ["visit layer batch of 101 characters", visitsSchemas.reportLayerSchema, { finishClass: "hardwax_oil", coats: 1, appliedOn: utcToday(), batchLot: "x".repeat(101) }, "batchLot", /100 characters/],
    ["visit layer product of 201 characters", visitsSchemas.reportLayerSchema, { finishClass: "hardwax_oil", coats: 1, appliedOn: utcToday(), productLabel: "x".repeat(201) }, "productLabel", /200 characters/],
    // A layer's surface has no default: the report form leaves an added layer's at "Choose a surface".
    ["visit layer with its surface not chosen", visitsSchemas.reportLayerSchema, { surface: "", finishClass: "hardwax_oil", coats: 1, appliedOn: utcToday() }, "surface", /Choose the surface this layer went on/],
    ["visit layer sent without a surface", visitsSchemas.reportLayerSchema, { finishClass: "hardwax_oil", coats: 1, appliedOn: utcToday() }, "surface", /Choose the surface this layer went on/],
  ];
  it.each(cases)("%s", (_label, schema, input, path, words) => {
    const r = schema.safeParse(input);
    expect(r.success).toBe(false);
    const mine = r.error!.issues.filter((i) => i.path.join(".") === path).map((i) => i.message);
    expect(mine.length).toBeGreaterThan(0);
    for (const m of mine) expect(m).not.toMatch(zodDefault);
    expect(mine.join(" ")).toMatch(words);
  });
});

describe("checks a schema gives no words of its own read in words (lib/validation/words.ts, the boundaries' error map)", () => {
  const zodDefault = /^(Too (big|small)|Invalid|Expected|expected|Unrecognized)/;
  // Each case: a schema parsed as the boundaries parse (route(), action(), the forms' resolver), the input, the words.
  const cases: [string, z.ZodType, unknown, RegExp][] = [
    ["a kind of piece we don't have (registry query)", piecesSchemas.pieceListQuerySchema, { kind: "zzz" }, /^Choose one of: dining_table, coffee_table, desk, bench, countertop, console, shelf, other\.$/],
    ["an enumeration of one value", inWordsSchemas.one, "b", /^Use a\.$/],
    ["a number given as text", inWordsSchemas.n, "lots", /^Enter a number\.$/],
    ["a missing field", inWordsSchemas.obj, {}, /^This is required\.$/],
    ["too long a string", inWordsSchemas.s, "x".repeat(11), /^At most 10 characters\.$/],
    ["an empty required string", inWordsSchemas.s, "", /^Fill this in\.$/],
    ["too big a number", inWordsSchemas.n, 1001, /^At most 1,000\.$/],
    ["too small a number (exclusive)", inWordsSchemas.n, 0, /^More than 0\.$/],
    ["too many items", inWordsSchemas.list, [1, 2, 3], /^At most 2 items\.$/],
    ["an e-mail without an @", inWordsSchemas.email, "nobody", /^Enter an e-mail address/],
    ["an unknown key on a strict object", inWordsSchemas.strict, { a: 1, b: 2 }, /^Unknown field: b\.$/],
  ];
  it.each(cases)("%s", (_label, schema, input, words) => {
    const plain = schema.safeParse(input);
    expect(plain.success).toBe(false);
    // Without the map zod answers in its own English (the reason for the map); with it, in ours.
    expect(plain.error!.issues[0]!.message).toMatch(zodDefault);
    const r = schema.safeParse(input, { error: inWords });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]!.message).not.toMatch(zodDefault);
    expect(r.error!.issues[0]!.message).toMatch(words);
  });

  it("a message written on the schema still wins over the map", () => {
    const r = piecesSchemas.pieceListQuerySchema.safeParse({ pageSize: "7" }, { error: inWords });
    expect(issues(r)).toEqual(["pageSize: Page size is 10, 25, 50 or 100."]);
  });
});

describe("the finish catalog's needed numbers: empty asks for the value, anything else not a number says so", () => {
  // The catalog form sends an empty number field as null (components/forms/field-values.ts numberOrNull,
  // the price field in components/catalog/catalog-manager.tsx), typed words as NaN; an API caller may send text.
  const base = { name: "Oil", finishClass: "hardwax_oil", coverageM2PerL: 10, containers: [{ ml: 250, priceMinor: 100 }] };
  const cases: [string, Record<string, unknown>, string, string][] = [
    ["coverage left empty", { ...base, coverageM2PerL: null }, "coverageM2PerL", "Enter the coverage."],
    ["coverage not sent", { ...base, coverageM2PerL: undefined }, "coverageM2PerL", "Enter the coverage."],
    ["coverage typed as words", { ...base, coverageM2PerL: Number("lots") }, "coverageM2PerL", "Coverage must be a number."],
    ["coverage sent as text", { ...base, coverageM2PerL: "ten" }, "coverageM2PerL", "Coverage must be a number."],
    ["container size left empty", { ...base, containers: [{ ml: null, priceMinor: 100 }] }, "containers.0.ml", "Enter the size."],
    ["container size typed as words", { ...base, containers: [{ ml: Number("big"), priceMinor: 100 }] }, "containers.0.ml", "Size must be a number."],
    ["price left empty", { ...base, containers: [{ ml: 250, priceMinor: null }] }, "containers.0.priceMinor", "Enter the price."],
    ["price typed as words", { ...base, containers: [{ ml: 250, priceMinor: Number.NaN }] }, "containers.0.priceMinor", "Price must be a number."],
  ];
  it.each(cases)("%s", (_label, input, path, words) => {
    const r = piecesSchemas.catalogProductSchema.safeParse(input);
    expect(r.success).toBe(false);
    expect(r.error!.issues.filter((i) => i.path.join(".") === path).map((i) => i.message)).toEqual([words]);
  });
  it("an emptied coverage in an edit asks for it too", () => {
    const r = piecesSchemas.catalogPatchSchema.safeParse({ coverageM2PerL: null });
    expect(r.success).toBe(false);
    expect(r.error!.issues.map((i) => i.message)).toEqual(["Enter the coverage."]);
  });
});

describe("a finish layer's coats: empty asks for them, anything else not a number says so", () => {
  // The layer fields send an empty coats box as null (components/pieces/layer-fields.tsx, numberOrNull).
  const layer = { surface: "top", finishClass: "hardwax_oil", appliedOn: "2026-01-10" };
  const cases: [string, Record<string, unknown>, string][] = [
    ["coats left empty", { ...layer, coats: null }, "Enter the number of coats."],
    ["coats not sent", { ...layer }, "Enter the number of coats."],
    ["coats typed as words", { ...layer, coats: Number("two") }, "Coats must be a number."],
    ["no coat", { ...layer, coats: 0 }, "At least one coat."],
  ];
  it.each(cases)("%s", (_label, input, words) => {
    const r = piecesSchemas.layerSchema.safeParse(input);
    expect(r.success).toBe(false);
    expect(r.error!.issues.filter((i) => i.path.join(".") === "coats").map((i) => i.message)).toEqual([words]);
  });
});
