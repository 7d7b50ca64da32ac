// The owner's unit default: their browser's region when its most preferred language
// names one, else the studio's unit system. Accept-Language syntax: RFC 9110 §12.5.4 (language ranges
// with q weights); language tags: BCP 47 (RFC 5646), region = ISO 3166-1 alpha-2 or UN M.49 digits.
import { describe, expect, it } from "vitest";
import { acceptLanguageRegion, defaultUnitSystem } from "@/lib/owner/preferences";

describe("acceptLanguageRegion", () => {
  it.each([
    ["en-US,en;q=0.9", "US"],
    ["en-GB,en;q=0.8", "GB"],
    ["de-DE", "DE"],
    ["zh-Hant-TW,zh;q=0.8", "TW"], // script subtag before the region
    ["es-419,es;q=0.9", "419"], // UN M.49 Latin America
    ["en;q=0.5, fr-CA;q=0.9", "CA"], // the highest weight wins, not the first listed
    ["fr-FR;q=0.9, en-US;q=0.9", "FR"], // equal weights: the first listed
    ["de,en-US;q=0.5", null], // the most preferred language names no region: a German reader, not an American
    ["en", null],
    ["*", null],
    ["", null],
    [null, null],
    ["en-US;q=0, en-GB", "GB"], // q=0 means "not acceptable"
    ["!!,en-LR", "LR"], // an unreadable tag is skipped
  ])("%j → %j", (header, region) => {
    expect(acceptLanguageRegion(header)).toBe(region);
  });
});

describe("defaultUnitSystem", () => {
  it("US, Liberia and Myanmar read imperial; every other named region metric, whatever the studio", () => {
    for (const h of ["en-US", "en-LR", "my-MM", "es-us"]) expect(defaultUnitSystem({ acceptLanguage: h, studioUnits: "metric" })).toBe("imperial");
    for (const h of ["en-GB", "en-CA", "de-DE", "es-419", "en-AU"]) expect(defaultUnitSystem({ acceptLanguage: h, studioUnits: "imperial" })).toBe("metric");
  });

  it("without a region the studio's unit system decides", () => {
    expect(defaultUnitSystem({ acceptLanguage: "en", studioUnits: "imperial" })).toBe("imperial");
    expect(defaultUnitSystem({ acceptLanguage: null, studioUnits: "metric" })).toBe("metric");
    expect(defaultUnitSystem({ studioUnits: "imperial" })).toBe("imperial");
  });
});
