// The one error line (components/ui/error-line.tsx) that fields and small forms show, and the staff plan
// page's line once "Try again now" finishes a plan's change of hands (components/plans/staff-plan-money.tsx).
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { TextField } from "@/components/ui/field";
import { ErrorLine } from "@/components/ui/error-line";
import { transferDoneWords } from "@/components/plans/staff-plan-money";

const html = (el: Parameters<typeof renderToStaticMarkup>[0]) => renderToStaticMarkup(el);

describe("ErrorLine", () => {
  it("says the message as an alert, with the id a field points at", () => {
    expect(html(createElement(ErrorLine, { id: "x-error" }, "Enter a name."))).toBe('<p id="x-error" role="alert" class="text-sm font-medium text-danger">Enter a name.</p>');
  });

  it("renders nothing when there is nothing to say", () => {
    for (const nothing of [undefined, null, "", false]) expect(html(createElement(ErrorLine, null, nothing))).toBe("");
  });

  it("a field with an error points at the line by aria-describedby and marks itself invalid", () => {
    const out = html(createElement(TextField, { id: "name", label: "Name", error: "Enter a name." }));
    expect(out).toContain('aria-invalid="true"');
    expect(out).toContain('aria-describedby="name-error"');
    expect(out).toContain('<p id="name-error" role="alert" class="text-sm font-medium text-danger">Enter a name.</p>');
    expect(html(createElement(TextField, { id: "name", label: "Name" }))).not.toContain("role=\"alert\"");
  });
});

describe("a plan's change of hands finished by 'Try again now'", () => {
  const at = "2026-07-14T09:05:00.000Z";
  it("says what the payment service confirmed and when, in the studio's zone with its name", () => {
    expect(transferDoneWords({ state: "active", transferStep: null, updatedAt: at }, "Europe/Berlin")).toBe(
      "Done, 14 July 2026 at 11:05 CEST: the change of hands is finished. The payment service confirmed it no longer renews on the former owner's card; the plan carries on for the new owner.",
    );
    expect(transferDoneWords({ state: "ended", transferStep: null, updatedAt: at }, "America/Los_Angeles")).toBe(
      "Done, 14 July 2026 at 02:05 PDT: the change of hands is finished. The payment service confirmed the plan's end, and any refund due to the former owner is paid.",
    );
  });

  it("says nothing while a step is still left", () => {
    expect(transferDoneWords({ state: "ended", transferStep: "refund", updatedAt: at }, "Europe/Berlin")).toBeNull();
  });
});
