// The browser's own zone in the time-zone picker (components/ui/zone-select.tsx) when the browser names
// a zone the server lists under its other id: Asia/Kolkata and Asia/Calcutta are one zone (IANA tz
// database, file "backward": Calcutta links to Kolkata; from memory). An account with no zone saved
// saw "India Time, Kolkata (this device)" beside "India Time, Kolkata"; it is offered once, under the
// list's id, and the form fills in that id (components/owner/preferences-form.tsx).
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { listedZone, ZoneSelect } from "@/components/ui/zone-select";
import { zoneGroups } from "@/lib/format";

const india = (html: string) => html.match(/<option[^>]*>India Time, Kolkata[^<]*<\/option>/g) ?? [];

describe("the device's zone against the server's list", () => {
  it("a browser's Asia/Kolkata beside a list with Asia/Calcutta: one option, the list's, not marked as this device's", () => {
    const choices = zoneGroups(["Asia/Calcutta", "Europe/Berlin"]);
    const html = renderToStaticMarkup(createElement(ZoneSelect, { label: "Time zone", choices, browserZone: "Asia/Kolkata" }));
    expect(india(html)).toEqual(['<option value="Asia/Calcutta">India Time, Kolkata</option>']);
    expect(html).not.toContain("this device");
    expect(listedZone(choices, "Asia/Kolkata")).toBe("Asia/Calcutta");
  });

  it("the other way round, and zones the list lacks or has: unchanged", () => {
    const choices = zoneGroups(["Asia/Kolkata", "Europe/Berlin"]);
    expect(india(renderToStaticMarkup(createElement(ZoneSelect, { label: "Time zone", choices, browserZone: "Asia/Calcutta" })))).toEqual(['<option value="Asia/Kolkata">India Time, Kolkata</option>']);
    expect(listedZone(choices, "Europe/Berlin")).toBe("Europe/Berlin");
    expect(listedZone(choices, "Asia/Tokyo")).toBe("Asia/Tokyo");
    expect(listedZone(choices, null)).toBeNull();
    expect(renderToStaticMarkup(createElement(ZoneSelect, { label: "Time zone", choices, browserZone: "Asia/Tokyo" }))).toContain("Japan Time, Tokyo (this device)");
  });
});
