import Stripe from "stripe";
import { describe, expect, it } from "vitest";
import { AppError, badRequest, conflict, payloadTooLarge, rephrased, serviceUnavailable, tooManyRequests, unsupportedMediaType } from "@/lib/errors";
import { errorResponse } from "@/lib/http/route";
import { callStripe } from "@/lib/payments/stripe";
import { asAppError } from "@/lib/validation/care-input";
import { CareInputError } from "@/lib/care/errors";

// The one set of error constructors (lib/errors.ts) and the one JSON shape they are answered with
// (lib/http/route.ts): `{ error: { code, message, fieldErrors? } }`, plus any fields a case sends beside it.

describe("error constructors", () => {
  it("a conflict names its case and may carry field errors and fields beside the error", async () => {
    const e = conflict("That time is no longer free.", { code: "slot_unavailable", fieldErrors: { start: ["Pick another time."] }, extra: { slots: [{ start: "x" }] } });
    expect([e.status, e.code]).toEqual([409, "slot_unavailable"]);
    const res = errorResponse(e);
    expect(res.status).toBe(409);
    expect(await res.json()).toEqual({
      slots: [{ start: "x" }],
      error: { code: "slot_unavailable", message: "That time is no longer free.", fieldErrors: { start: ["Pick another time."] } },
    });
    expect(conflict("Taken.").code).toBe("conflict");
  });

  it("fields beside the error never replace the error itself", async () => {
    const e = conflict("Refused.", { extra: { error: "spoofed" } });
    expect(((await errorResponse(e).json()) as { error: { message: string } }).error.message).toBe("Refused.");
  });

  it("a rephrased error keeps its status, code, field errors and wait", () => {
    const waited = rephrased(tooManyRequests(120), "The refund waits: too many attempts.");
    expect([waited.status, waited.code, waited.retryAfterSec, waited.message]).toEqual([429, "rate_limited", 120, "The refund waits: too many attempts."]);
    const fields = rephrased(badRequest("No.", { email: ["Taken."] }), "Pick the client instead.");
    expect(fields.fieldErrors).toEqual({ email: ["Taken."] });
    expect(rephrased(fields, "Other words.", { buyerEmail: ["Taken."] }).fieldErrors).toEqual({ buyerEmail: ["Taken."] });
  });

  it("one 413 text and one 415 code", () => {
    expect(payloadTooLarge(1024 * 1024).message).toBe("That is too large: we take up to 1 MB at a time. Send a smaller one.");
    expect(payloadTooLarge(64 * 1024).message).toBe("That is too large: we take up to 64 KB at a time. Send a smaller one.");
    expect(unsupportedMediaType("Send a JPEG.").code).toBe("unsupported_media_type");
  });

  it("the care engine's input error is a 400 out_of_range", () => {
    const e = asAppError(new CareInputError("date out of range", "doneOn.date"));
    expect(e).toBeInstanceOf(AppError);
    expect([e?.status, e?.code]).toEqual([400, "out_of_range"]);
    expect(e?.message).toContain("a date that far out");
  });
});

describe("payment service failures", () => {
  it("an unreachable service is a 503 that says nothing was charged; a refusal is a 409 with the provider's words", async () => {
    const unreachable = await callStripe("take the payment", () => Promise.reject(new Stripe.errors.StripeConnectionError({ message: "connect ECONNREFUSED" }))).catch((e: unknown) => e);
    expect(unreachable).toMatchObject({ status: 503, code: "payment_service_unavailable" });
    expect((unreachable as Error).message).toContain("Nothing was charged");
    const refused = await callStripe("refund the payment", () => Promise.reject(new Stripe.errors.StripeInvalidRequestError({ message: "Charge already refunded." }))).catch((e: unknown) => e);
    expect(refused).toMatchObject({ status: 409, code: "payment_service_refused", message: "The payment service refused to refund the payment: Charge already refunded." });
    expect(serviceUnavailable("x", "y").status).toBe(503);
  });
});
