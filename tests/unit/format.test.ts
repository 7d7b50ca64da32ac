// lib/format, the one formatter. Money and dates are Intl output (ECMA-402, 11th edition (2024):
// §15 NumberFormat with style "currency", §11 DateTimeFormat) over Unicode CLDR locale data (v46+,
// as Node's ICU carries it): the expected strings are CLDR's patterns, noted beside each check.
// Calendar dates and instants are fixed; nothing reads the real clock. ESLint keeps Intl and
// toLocale*String inside lib/format (and lib/care): the last block lints one-line modules with the
// project's real configuration.
import path from "node:path";
import { ESLint } from "eslint";
import { describe, expect, it } from "vitest";
import {
  formatBasisPoints,
  formatBytes,
  formatCount,
  formatAgo,
  formatDate,
  formatInstant,
  formatMoney,
  formatMonth,
  formatPercentBp,
  formatRetryWait,
  formatDuration,
  formatVisitWhen,
  formatWait,
  formatZone,
  isTimeZone,
  moneyLocale,
  visitDayWord,
} from "@/lib/format";

const NBSP = "\u00a0";
const NNBSP = "\u202f";

describe("money from minor units", () => {
  it("writes each country's form, from the exact decimal", () => {
    // CLDR en-US currency pattern "¤#,##0.00": symbol before, no space.
    expect(formatMoney(8500, "USD", "US")).toBe("$85.00");
    expect(formatMoney(123456789, "USD", "US")).toBe("$1,234,567.89");
    // CLDR de currency pattern "#,##0.00 ¤": decimal comma, grouping dot, no-break space, symbol after.
    expect(formatMoney(8500, "EUR", "DE")).toBe(`85,00${NBSP}€`);
    expect(formatMoney(123450, "EUR", "DE")).toBe(`1.234,50${NBSP}€`);
    // CLDR fr: grouping by narrow no-break space, decimal comma, symbol after.
    expect(formatMoney(123450, "EUR", "FR")).toBe(`1${NNBSP}234,50${NBSP}€`);
    // ISO 4217: JPY has no minor unit, so 1235 minor units are ¥1,235 (CLDR ja uses the fullwidth yen sign).
    expect(formatMoney(1235, "JPY", "JP")).toBe("￥1,235");
    // A negative amount keeps its sign; 1 cent is not rounded away.
    expect(formatMoney(-1, "USD", "US")).toBe("-$0.01");
    // 2^53 + 1 minor units would lose its last digit as minor ÷ 100 in floating point.
    expect(formatMoney(900719925474099, "USD", "US")).toBe("$9,007,199,254,740.99");
  });

  it("never writes a currency code after the amount", () => {
    for (const [currency, country] of [["USD", "US"], ["EUR", "DE"], ["EUR", "FR"], ["GBP", "GB"], ["CAD", "CA"]] as const) {
      expect(formatMoney(8500, currency, country)).not.toMatch(/[A-Z]{3}$/);
    }
  });

  it("reads the locale from the studio's country (CLDR likely subtags)", () => {
    expect(moneyLocale("US")).toBe("en-US");
    expect(moneyLocale("DE")).toBe("de-DE");
    expect(moneyLocale("FR")).toBe("fr-FR");
    expect(moneyLocale("not a region")).toBe("en-US");
  });

  it("writes rates and counts", () => {
    expect(formatPercentBp(825)).toBe("8.25 %");
    expect(formatPercentBp(2000)).toBe("20 %");
    expect([formatBasisPoints(725), formatBasisPoints(1000), formatBasisPoints(0), formatBasisPoints(5)]).toEqual(["7.25", "10", "0", "0.05"]); // a form field's value
    expect(formatPercentBp(0)).toBe("0 %");
    expect(formatCount(12345)).toBe("12,345");
  });
});

describe("dates and times", () => {
  it("writes a calendar date one way, with or without a weekday (CLDR en-GB: d MMMM y, EEEE, d MMMM y)", () => {
    expect(formatDate("2026-12-03")).toBe("3 December 2026");
    expect(formatDate("2026-12-03", { short: true })).toBe("3 Dec 2026");
    expect(formatDate("2026-12-03", { weekday: "long" })).toBe("Thursday, 3 December 2026");
    expect(formatDate("2026-12-03", { weekday: "short", short: true, year: false })).toBe("Thu 3 Dec");
    // With its year too, the same form: no comma after the weekday (Intl's en-GB puts one there only then).
    expect(formatDate("2026-12-06", { weekday: "short", short: true })).toBe("Sun 6 Dec 2026");
    expect(formatMonth("2026-03")).toBe("March 2026");
    expect(formatMonth("2026-03", { short: true })).toBe("Mar 2026");
    // Short months are the month's first three letters, September included: CLDR en-GB, as Node's ICU carries it, writes
    // "Sept" for its abbreviated September alone, which put "Sept ’26" among "Aug" and "Oct" on a chart axis.
    expect(formatMonth("2026-09", { short: true })).toBe("Sep 2026");
    expect(formatDate("2026-09-03", { short: true })).toBe("3 Sep 2026");
    expect(formatDate("2026-09-03", { weekday: "short", short: true, year: false })).toBe("Thu 3 Sep");
    expect(Array.from({ length: 12 }, (_, i) => formatMonth(`2026-${String(i + 1).padStart(2, "0")}`, { short: true }).split(" ")[0])).toEqual(["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"]);
    expect(formatMonth("2026-09")).toBe("September 2026");
    // A calendar date is the same day in every zone: 1 January stays 1 January.
    expect(formatDate("2027-01-01")).toBe("1 January 2027");
    expect(formatDate("not a date")).toBe("not a date");
  });

  it("writes an instant in its zone and names the zone whenever it shows a time", () => {
    const at = Date.parse("2026-12-03T23:30:00Z");
    // 23:30 UTC is 00:30 on 4 December in Berlin (CET, UTC+1) and 18:30 on 3 December in New York (UTC−5).
    expect(formatInstant(at, "Europe/Berlin")).toBe("4 December 2026");
    expect(formatInstant(at, "America/New_York")).toBe("3 December 2026");
    expect(formatInstant(at, "Europe/Berlin", { time: true })).toBe("4 December 2026 at 00:30 CET");
    // CLDR en-GB carries short names for the European metazones only ("GMT-5" for New York); en-US
    // carries the North American ones, so those come from there; elsewhere the offset stays.
    expect(formatInstant(new Date(at).toISOString(), "America/New_York", { time: true })).toBe("3 December 2026 at 18:30 EST");
    expect(formatInstant(Date.parse("2026-07-01T16:00:00Z"), "America/Los_Angeles", { time: true })).toBe("1 July 2026 at 09:00 PDT");
    expect(formatInstant(at, "Asia/Tokyo", { time: true })).toBe("4 December 2026 at 08:30 GMT+9");
  });

  it("writes a visit's slot on the 24-hour clock, naming its zone", () => {
    // Zone short names as CLDR writes them (en-US for North America, en-GB for Europe), as above.
    expect(formatVisitWhen(Date.parse("2026-12-03T14:00:00Z"), Date.parse("2026-12-03T16:00:00Z"), "America/New_York")).toBe("Thursday, 3 December 2026, 09:00–11:00 EST");
    expect(formatVisitWhen(Date.parse("2027-05-04T13:00:00Z"), Date.parse("2027-05-04T14:30:00Z"), "Europe/Berlin")).toBe("Tuesday, 4 May 2027, 15:00–16:30 CEST");
    // Across the spring-forward hour (New York, 14 March 2027 at 02:00 EST becomes 03:00 EDT) the end's zone is named.
    expect(formatVisitWhen(Date.parse("2027-03-14T06:30:00Z"), Date.parse("2027-03-14T07:30:00Z"), "America/New_York")).toBe("Sunday, 14 March 2027, 01:30–03:30 EDT");
  });

  it("knows IANA zones", () => {
    expect(isTimeZone("Europe/Berlin")).toBe(true);
    expect(isTimeZone("Mars/Olympus_Mons")).toBe(false);
  });

  it("names a zone as people say it, never as its IANA identifier", () => {
    // Generic zone names from Unicode CLDR through ECMA-402 (timeZoneName: "longGeneric").
    expect(formatZone("America/Los_Angeles")).toBe("Pacific Time, Los Angeles");
    expect(formatZone("America/New_York")).toBe("Eastern Time, New York");
    expect(formatZone("Europe/Berlin")).toBe("Central European Time, Berlin");
    expect(formatZone("UTC")).toBe("UTC");
    // Named as they are now, not as in 1970 (Kyiv was on Moscow time then, Lisbon on Central European),
    // and under the place's present name where the runtime lists an old one.
    expect(formatZone("Europe/Kiev")).toBe("Eastern European Time, Kyiv");
    expect(formatZone("Europe/Riga")).toBe("Eastern European Time, Riga");
    expect(formatZone("Europe/Lisbon")).toBe("Western European Time, Lisbon");
    expect(formatZone("Asia/Calcutta")).toBe("India Time, Kolkata");
    for (const z of ["America/Los_Angeles", "America/Argentina/Buenos_Aires", "Pacific/Auckland"]) expect(formatZone(z)).not.toMatch(/[_/]/);
  });
});

describe("today and tomorrow by the reader's own calendar", () => {
  it("counts calendar days in the reader's zone, not 24-hour spans", () => {
    const nine = Date.parse("2026-12-03T14:00:00Z"); // 09:00 in New York
    expect(visitDayWord(nine, Date.parse("2026-12-03T13:42:00Z"), "America/New_York")).toBe("today"); // 08:42 that day
    expect(visitDayWord(nine, Date.parse("2026-12-02T14:30:00Z"), "America/New_York")).toBe("tomorrow"); // 09:30 the day before: under 24 h
    expect(visitDayWord(nine, Date.parse("2026-12-01T23:00:00Z"), "America/New_York")).toBe("on Thursday, 3 December 2026");
  });
});

describe("waits (house style, no published source)", () => {
  const H = 3_600_000;
  it("short for lists: minutes, then hours to two days, then days and hours, then days", () => {
    expect(formatWait(-5_000)).toBe("under a minute"); // a clock a little behind: never "0 min"
    expect(formatWait(0)).toBe("under a minute");
    expect(formatWait(59_999)).toBe("under a minute");
    expect(formatWait(60_000)).toBe("1 min");
    expect(formatWait(40 * 60_000)).toBe("40 min");
    expect(formatWait(3 * H + 59 * 60_000)).toBe("3 h");
    expect(formatWait(47 * H)).toBe("47 h");
    expect(formatWait(52 * H)).toBe("2 d 4 h");
    expect(formatWait(96 * H + 30 * 60_000)).toBe("4 d"); // no "4 d 0 h"
    expect(formatWait(12 * 24 * H + 5 * H)).toBe("12 d");
  });
  it("how long ago, for lists: 'just now' under a minute, never '0 min ago'", () => {
    expect(formatAgo(-5_000)).toBe("just now");
    expect(formatAgo(59_999)).toBe("just now");
    expect(formatAgo(60_000)).toBe("1 min ago");
    expect(formatAgo(52 * H)).toBe("2 d 4 h ago");
  });
  it("how long a visit takes, in a sentence, to the quarter hour (it read '0.5 h')", () => {
    expect([30, 60, 90, 120, 45, 5].map(formatDuration)).toEqual(["30 minutes", "1 hour", "1 hour 30 minutes", "2 hours", "45 minutes", "15 minutes"]);
  });
  it("when to try again, in a sentence", () => {
    expect(formatRetryWait(0.2)).toBe("1 second");
    expect(formatRetryWait(20)).toBe("20 seconds");
    expect(formatRetryWait(150)).toBe("3 minutes");
  });
  it("size limits, rounded down", () => {
    expect([formatBytes(15 * 1024 * 1024), formatBytes(256 * 1024), formatBytes(1_500_000), formatBytes(10)]).toEqual(["15 MB", "256 KB", "1 MB", "1 KB"]);
  });
});

describe("the lint rule keeps formatting in lib/format", () => {
  const eslint = new ESLint({ cwd: path.resolve(import.meta.dirname, "../..") });
  async function flagged(filePath: string, code: string): Promise<boolean> {
    const [result] = await eslint.lintText(code, { filePath });
    return result!.messages.some((m) => m.ruleId === "no-restricted-syntax" && m.message.includes("lib/format"));
  }

  it.each([
    ["a page building a NumberFormat", "app/studio/x/page.tsx", 'export const x = new Intl.NumberFormat("en-US").format(1);\n'],
    ["a component building a DateTimeFormat", "components/x/y.tsx", 'export const x = new Intl.DateTimeFormat("en-GB").format(0);\n'],
    ["a lib module calling toLocaleString", "lib/x/y.ts", "export const x = (1234).toLocaleString();\n"],
    ["an e-mail calling toLocaleDateString", "emails/x.tsx", "export const x = new Date(0).toLocaleDateString();\n"],
    ["Intl.DateTimeFormat called without new", "components/x/y.tsx", "export const x = Intl.DateTimeFormat().resolvedOptions().timeZone;\n"],
  ])("flags %s", async (_what, filePath, code) => {
    expect(await flagged(filePath, code)).toBe(true);
  });

  it.each([
    ["lib/format itself", "lib/format/x.ts", 'export const x = new Intl.NumberFormat("en-US").format(1);\n'],
    ["lib/care's zone arithmetic", "lib/care/x.ts", 'export const x = new Intl.DateTimeFormat("en-US", { timeZone: "UTC" });\n'],
  ])("allows %s", async (_what, filePath, code) => {
    expect(await flagged(filePath, code)).toBe(false);
  });

  it("still flags a hand-made AppError beside the formatter rule", async () => {
    const [result] = await eslint.lintText('import { AppError } from "@/lib/errors";\nexport const e = new AppError(400, "x", "y");\n', { filePath: "lib/x/y.ts" });
    expect(result!.messages.some((m) => m.ruleId === "no-restricted-syntax" && m.message.includes("lib/errors.ts"))).toBe(true);
  });
});
