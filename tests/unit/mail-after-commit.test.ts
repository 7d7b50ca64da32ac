import { afterEach, describe, expect, it, vi } from "vitest";
import { mailAfterCommit } from "@/lib/mail/after-commit";

// Mail about a committed change never undoes it: a send that fails is logged under its name, and the
// caller carries on (lib/mail/after-commit.ts).
describe("mailAfterCommit", () => {
  afterEach(() => vi.restoreAllMocks());

  it("a send that throws is logged with what it was, and the caller is not told", async () => {
    const logged = vi.spyOn(console, "error").mockImplementation(() => {});
    await expect(mailAfterCommit("visit booked", () => Promise.reject(new Error("template broke")))).resolves.toBeUndefined();
    expect(logged).toHaveBeenCalledTimes(1);
    expect(String(logged.mock.calls[0]?.[0])).toContain("visit booked");
  });

  it("a send that works runs once and logs nothing", async () => {
    const logged = vi.spyOn(console, "error").mockImplementation(() => {});
    const send = vi.fn(() => Promise.resolve("250 OK"));
    await mailAfterCommit("claim decision", send);
    expect(send).toHaveBeenCalledTimes(1);
    expect(logged).not.toHaveBeenCalled();
  });
});
