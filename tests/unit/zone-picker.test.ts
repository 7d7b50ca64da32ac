// The time-zone picker (components/ui/zone-select.tsx, options from lib/format zoneGroups): every zone
// named in words, grouped by region, sorted by its name, the IANA id kept as the value that is saved.
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { ZoneSelect } from "@/components/ui/zone-select";
import { formatZone, hasZone, zoneChoices, zoneGroups, zoneLabel } from "@/lib/format";

const ALL = Intl.supportedValuesOf("timeZone");

describe("time-zone picker options", () => {
  it("names each zone in words and keeps its IANA id as the value", () => {
    const { utc, groups } = zoneGroups(["America/Los_Angeles", "Europe/Berlin", "America/New_York", "Pacific/Auckland"]);
    expect(utc).toEqual({ value: "UTC", label: "UTC (Coordinated Universal Time)" });
    expect(groups).toEqual([
      { region: "Europe", zones: [{ value: "Europe/Berlin", label: "Central European Time, Berlin" }] },
      { region: "Pacific", zones: [{ value: "Pacific/Auckland", label: "New Zealand Time, Auckland" }] },
      {
        region: "The Americas",
        zones: [
          { value: "America/New_York", label: "Eastern Time, New York" },
          { value: "America/Los_Angeles", label: "Pacific Time, Los Angeles" },
        ],
      },
    ]);
  });

  it("over the runtime's whole list: no id, underscore or slash in a label, every label unique, every zone once, sorted in its region", () => {
    const { utc, groups } = zoneGroups(ALL);
    const options = [utc, ...groups.flatMap((g) => g.zones)];
    expect(new Set(options.map((o) => o.value))).toEqual(new Set([...ALL, "UTC"]));
    expect(options).toHaveLength(new Set([...ALL, "UTC"]).size);
    for (const o of options) {
      expect(o.label, o.value).not.toMatch(/[_/]/);
      expect(o.label, o.value).toContain(formatZone(o.value) === "UTC" ? "UTC" : formatZone(o.value));
    }
    expect(new Set(options.map((o) => o.label)).size).toBe(options.length);
    for (const g of groups) expect(g.zones.map((z) => z.label)).toEqual([...g.zones.map((z) => z.label)].sort((a, b) => a.localeCompare(b, "en")));
    expect(groups.map((g) => g.region)).toEqual(expect.arrayContaining(["Africa", "Asia", "Europe", "The Americas"]));
  });

  it("a saved zone the list lacks is still offered, and any zone reads back in words", () => {
    const { groups } = zoneGroups(["Europe/Berlin"], ["Asia/Kolkata", null]);
    expect(groups.flatMap((g) => g.zones).map((z) => z.value)).toEqual(["Asia/Kolkata", "Europe/Berlin"]);
    // A saved zone under another name than the runtime lists (this Node lists Asia/Calcutta).
    const c = zoneChoices(["Asia/Kolkata"]);
    expect(hasZone(c, "Asia/Kolkata")).toBe(true);
    expect(zoneLabel(c, "Asia/Kolkata")).toBe("India Time, Kolkata");
    expect(zoneLabel(c, "America/Los_Angeles")).toBe("Pacific Time, Los Angeles");
    expect(zoneLabel(c, "UTC")).toBe("UTC (Coordinated Universal Time)");
  });

  it("a saved zone under another name of a zone the list has is offered once, under the saved name", () => {
    // Asia/Kolkata and Asia/Calcutta are one zone (IANA tz database, file "backward": Calcutta links to
    // Kolkata; from memory); which of the two the runtime lists depends on its ICU. Either saved, "India Time, Kolkata" shows once.
    for (const saved of ["Asia/Kolkata", "Asia/Calcutta"]) {
      const c = zoneChoices([saved]);
      const options = [c.utc, ...c.groups.flatMap((g) => g.zones)];
      expect(options.filter((o) => o.label === "India Time, Kolkata").map((o) => o.value), saved).toEqual([saved]);
      expect(new Set(options.map((o) => o.label)).size, saved).toBe(options.length);
      expect(zoneLabel(c, saved)).toBe("India Time, Kolkata");
    }
    // The same for the other renamed zones this runtime may list under their old names.
    for (const saved of ["Europe/Kyiv", "Asia/Ho_Chi_Minh"]) {
      const options = zoneChoices([saved]).groups.flatMap((g) => g.zones);
      expect(options.filter((o) => o.label === formatZone(saved)).map((o) => o.value), saved).toEqual([saved]);
    }
  });

  it("renders one labelled select with optgroups whose options show words and submit the IANA id", () => {
    const choices = zoneGroups(["America/Los_Angeles", "Europe/Berlin"]);
    const html = renderToStaticMarkup(createElement(ZoneSelect, { label: "Time zone", choices, name: "timeZone", defaultValue: "America/Los_Angeles" }));
    expect(html).toMatch(/<label[^>]*>Time zone<\/label>/);
    expect(html).toContain('<optgroup label="The Americas"><option value="America/Los_Angeles" selected="">Pacific Time, Los Angeles</option></optgroup>');
    expect(html).toContain('<option value="Europe/Berlin">Central European Time, Berlin</option>');
    expect(html.replace(/value="[^"]*"/g, "")).not.toMatch(/America\/|Los_Angeles/);
    // The browser's own zone, when the list lacks it, is offered too (it appears only after hydration).
    const withDevice = renderToStaticMarkup(createElement(ZoneSelect, { label: "Time zone", choices, browserZone: "Asia/Tokyo" }));
    expect(withDevice).toContain('<option value="Asia/Tokyo">Japan Time, Tokyo (this device)</option>');
    expect(renderToStaticMarkup(createElement(ZoneSelect, { label: "Time zone", choices, browserZone: "Europe/Berlin" }))).not.toContain("this device");
  });
});
