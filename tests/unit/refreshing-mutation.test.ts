// The one way a page's button changes something (components/forms/use-refreshing-mutation.ts): what a
// refusal reads as, and a server action's answer taken like a route's (components/api-client.ts
// actionData), so the hook shows both kinds of call the same way.
import { describe, expect, it } from "vitest";
import { ApiError, actionData, isApiError } from "@/components/api-client";
import { afterSuccess, loadRefusalWords, refusalWords } from "@/components/forms/use-refreshing-mutation";

describe("refusalWords", () => {
  it("shows the API's own message, with its field messages only when asked", () => {
    const e = new ApiError(422, "Check the highlighted fields.", "invalid", { email: ["Enter an e-mail address."], name: ["Enter a name."] });
    expect(refusalWords(e)).toBe("Check the highlighted fields.");
    expect(refusalWords(e, true)).toBe("Check the highlighted fields. Enter an e-mail address. Enter a name.");
  });

  it("gives one plain line for anything that is not an answer from the API", () => {
    expect(refusalWords(new TypeError("Failed to fetch"))).toBe("That didn't go through. Check your connection and try again.");
    expect(refusalWords(undefined)).toBe("That didn't go through. Check your connection and try again.");
  });
});

describe("loadRefusalWords", () => {
  it("says what is wrong with what a list asked for, not only that something is", () => {
    const e = new ApiError(400, "Some fields need a second look.", "invalid", { q: ["Search for at most 200 characters."] });
    expect(loadRefusalWords(e)).toBe("Search for at most 200 characters.");
    expect(loadRefusalWords(new ApiError(404, "That client isn't in this studio.", "not_found"))).toBe("That client isn't in this studio.");
  });

  it("never shows the browser's own words when no answer came", () => {
    expect(loadRefusalWords(new TypeError("Failed to fetch"))).toBe("That didn't go through. Check your connection and try again.");
  });
});

describe("actionData", () => {
  it("answers a server action's data and message on success", async () => {
    await expect(actionData(Promise.resolve({ ok: true as const, data: { id: "m1" }, message: "Role changed." }))).resolves.toEqual({ data: { id: "m1" }, message: "Role changed." });
  });

  it("turns a server action's refusal into an ApiError with its message and field messages", async () => {
    const refused = await actionData(Promise.resolve({ ok: false as const, message: "The studio needs at least one admin.", fieldErrors: { role: ["Pick another role."] } })).catch((e: unknown) => e);
    expect(isApiError(refused)).toBe(true);
    const e = refused as ApiError;
    expect([e.status, e.message, e.fieldErrors]).toEqual([400, "The studio needs at least one admin.", { role: ["Pick another role."] }]);
    expect(refusalWords(e, true)).toBe("The studio needs at least one admin. Pick another role.");
  });
});

describe("afterSuccess", () => {
  it("fetches the page again by default, and not when the component follows the change itself", () => {
    expect(afterSuccess(null)).toEqual({ refresh: true });
    expect(afterSuccess(undefined, "always")).toEqual({ refresh: true });
    expect(afterSuccess(null, "never")).toEqual({ refresh: false });
  });

  it("goes to a path in the app (and reads it fresh), or opens an address outside it", () => {
    expect(afterSuccess("/studio/pieces", "never")).toEqual({ push: "/studio/pieces", refresh: true });
    expect(afterSuccess("http://127.0.0.1:4801/pay/cs_1")).toEqual({ open: "http://127.0.0.1:4801/pay/cs_1", refresh: false });
  });
});
