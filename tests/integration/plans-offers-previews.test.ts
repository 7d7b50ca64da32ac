// The settings' e-mail previews show the mails that carry care plans: the hand-over mail and the care
// reminder with its refresh offer list a plan (the latter with the last year's saving), and the plan
// mails (payment failed, included visit) are there too. Rendered as lib/mail renders real mail.
import { describe, expect, it } from "vitest";
import { listEmailTemplates, renderEmailPreview } from "@/lib/settings/email-previews";
import { createStudio, memberContext } from "../support/fixtures";

describe("e-mail previews of the care plan mails", () => {
  it("lists them and renders each with its plan lines", async () => {
    const admin = await memberContext(createStudio(), "admin");
    expect(listEmailTemplates(admin).map((t) => t.slug)).toEqual(expect.arrayContaining(["hand-over", "care-reminder-offer", "plan-grace", "plan-visit"]));

    const handOver = await renderEmailPreview(admin, "hand-over");
    expect(handOver.text).toContain("A care plan from Larchmere Slab & Resin (invented) for this piece");
    expect(handOver.text).toContain("Oiled top care (invented) · $240.00 a year");
    expect(handOver.text).not.toContain("would have saved");

    const offer = await renderEmailPreview(admin, "care-reminder-offer");
    expect(offer.text).toContain("Accept the refresh offer");
    expect(offer.text).toContain("so it would have saved you $16.78.");
    expect(offer.html).toMatch(/<html/i);

    expect((await renderEmailPreview(admin, "plan-grace")).text).toContain("Yearly finish keeping");
    expect((await renderEmailPreview(admin, "plan-visit")).text).toContain("Yearly finish keeping");
  });
});
