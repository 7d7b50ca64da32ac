// The development outbox's list (components/outbox/outbox-list.tsx): a message's time reads in words in
// the studio's zone, with the zone named, not as an ISO stamp, on a line of its own.
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { OutboxList } from "@/components/outbox/outbox-list";

const message = { id: "m1", receivedAt: "2026-12-04T15:40:00.000Z", subject: "Your table's first oiling", to: ["owner@owners.example"], text: "", html: "", headers: {}, attachments: [] };

describe("OutboxList", () => {
  it("gives a message's time in the studio's zone, zone named", () => {
    const html = renderToStaticMarkup(createElement(OutboxList, { messages: [message], timeZone: "America/Los_Angeles" }));
    // On a line of its own, which is never cut short (the address line above it may be).
    expect(html).toContain('<span class="block text-sm text-muted">4 December 2026 at 07:40 PST</span>');
    expect(html).not.toMatch(/2026-12-04|UTC/);
  });
});
