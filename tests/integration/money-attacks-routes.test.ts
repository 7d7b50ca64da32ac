// The money routes called as the browser calls them (the one request boundary, lib/http/route.ts), by
// people who shouldn't move money or with bodies nobody should send: a staff member removed from the
// studio, another studio's admin, amounts that are zero, negative, fractional, text or huge. Each is a
// 4xx with words and no request reaches Stripe. A real session in the test database (next/headers holds
// its cookie: tests/support/session-jar.ts); the real Stripe fake over HTTP. Invented.
import { and, eq } from "drizzle-orm";
import { NextRequest } from "next/server";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { POST as approveRoute } from "@/app/api/jobs/[id]/approve/route";
import { POST as refundRoute } from "@/app/api/jobs/[id]/refund/route";
import { getDb } from "@/db/client";
import { memberships, type Studio } from "@/db/schema";
import { SUCCESS_CARD } from "@/lib/fakes/stripe-fake";
import { getOwnerJob, getStudioJob } from "@/lib/repairs/jobs";
import { approveJob } from "@/lib/repairs/payment";
import { jar, signInToJar } from "../support/session-jar";
import { createStudio, memberContext, unique } from "../support/fixtures";
import { plansStripeForFile, until } from "../support/plans-stripe";
import { quotedRepairJob } from "../support/repair-quote";

vi.mock("next/headers", () => import("../support/session-jar").then((m) => m.nextHeaders));
beforeEach(() => jar.clear());

const stripe = plansStripeForFile();

async function call(handler: typeof refundRoute, path: string, params: Record<string, string>, body: unknown) {
  const req = new NextRequest(`http://localhost:3999${path}`, { method: "POST", body: typeof body === "string" ? body : JSON.stringify(body), headers: { "content-type": "application/json" } });
  const res = await handler(req, { params: Promise.resolve(params as never) });
  return { status: res.status, json: (await res.json()) as { error?: { message: string } } };
}

/** A job of `studio` paid by its owner through the fake's page, as staff read it. */
async function paidJob(studio: Studio) {
  const { staff, owner, job } = await quotedRepairJob(studio);
  const { checkoutUrl } = await approveJob(owner, job.id);
  expect((await fetch(checkoutUrl!, { method: "POST", body: new URLSearchParams({ card: SUCCESS_CARD }), redirect: "manual" })).status).toBe(303);
  await until(() => getStudioJob(staff, job.id).job.state === "paid", 15_000);
  return { staff, owner, job: getStudioJob(staff, job.id).job };
}

const refundCalls = () => stripe.fake.requests().filter((r) => r.path === "/v1/refunds").length;

describe("giving money back on a job, by the wrong people or with the wrong amounts", () => {
  it("a staff member removed from the studio, and another studio's admin, move nothing", async () => {
    const studio = createStudio({ email: `${unique("refund-who")}@test.example`, taxRateBp: 0 });
    const { staff, job } = await paidJob(studio);
    const ask = { version: job.version, refundableMinor: job.totalMinor, amountMinor: 100, reason: "A scratch we left on the leg" };
    const before = refundCalls();

    // Removed from the studio after the page was opened: the same session is refused.
    await signInToJar(staff.user.id);
    getDb().delete(memberships).where(and(eq(memberships.userId, staff.user.id), eq(memberships.studioId, studio.id))).run();
    const removed = await call(refundRoute, `/api/jobs/${job.id}/refund`, { id: job.id }, ask);
    expect([401, 403, 404]).toContain(removed.status);

    const other = await memberContext(createStudio({ email: `${unique("other")}@test.example` }), "admin");
    await signInToJar(other.user.id);
    const stranger = await call(refundRoute, `/api/jobs/${job.id}/refund`, { id: job.id }, ask);
    expect(stranger.status).toBe(404);
    expect(refundCalls()).toBe(before);
  });

  it("zero, negative, fractional, text, huge or missing amounts are a 400 with words; nothing reaches Stripe", async () => {
    const studio = createStudio({ email: `${unique("refund-what")}@test.example`, taxRateBp: 0 });
    const { staff, job } = await paidJob(studio);
    await signInToJar(staff.user.id);
    const base = { version: job.version, refundableMinor: job.totalMinor, reason: "A scratch we left on the leg" };
    const before = refundCalls();
    for (const amountMinor of [0, -100, 0.5, "100", 1e30, null, Number.MAX_SAFE_INTEGER + 2]) {
      const r = await call(refundRoute, `/api/jobs/${job.id}/refund`, { id: job.id }, { ...base, amountMinor });
      expect(r.status, String(amountMinor)).toBe(400);
      expect(r.json.error?.message, String(amountMinor)).toMatch(/^[A-Z]/);
    }
    for (const body of ["", "{", "[]", JSON.stringify({ ...base }), JSON.stringify({ ...base, amountMinor: 100, version: "1" }), JSON.stringify({ ...base, amountMinor: 100, reason: "x".repeat(301) })]) {
      const r = await call(refundRoute, `/api/jobs/${job.id}/refund`, { id: job.id }, body);
      expect(r.status, body.slice(0, 40)).toBe(400);
    }
    expect((await call(refundRoute, `/api/jobs/${job.id}/refund`, { id: job.id }, JSON.stringify({ ...base, amountMinor: 100, reason: "x".repeat(5000) }))).status).toBe(413);
    expect(refundCalls()).toBe(before);
    // The confirmed amount goes through, once.
    const ok = await call(refundRoute, `/api/jobs/${job.id}/refund`, { id: job.id }, { ...base, amountMinor: 100 });
    expect(ok.status).toBe(200);
    expect(refundCalls()).toBe(before + 1);
  });
});

describe("approving a quote with a body nobody's page sends", () => {
  it("text, fractions or negatives for the version and total are a 400; another owner's job is a 404; no payment page is opened", async () => {
    const studio = createStudio({ email: `${unique("approve-what")}@test.example`, taxRateBp: 0 });
    const { owner, job } = await quotedRepairJob(studio);
    const sessions = () => stripe.fake.sessions().filter((s) => s.client_reference_id === job.id).length;
    await signInToJar(owner.id);
    for (const body of [{ quoteVersion: "1", totalMinor: job.totalMinor }, { quoteVersion: 1.5, totalMinor: job.totalMinor }, { quoteVersion: job.quoteVersion, totalMinor: -1 }, { quoteVersion: job.quoteVersion, totalMinor: 19.99 }]) {
      expect((await call(approveRoute, `/api/jobs/${job.id}/approve`, { id: job.id }, body)).status, JSON.stringify(body)).toBe(400);
    }
    // No body at all (a client that skips the stale-quote check): a 400 that says to reload, and nothing approved.
    for (const body of ["", "null"]) {
      const bare = await call(approveRoute, `/api/jobs/${job.id}/approve`, { id: job.id }, body);
      expect(bare.status, JSON.stringify(body)).toBe(400);
      expect(bare.json.error?.message, JSON.stringify(body)).toMatch(/^Reload the page and approve again/);
    }
    const empty = (await call(approveRoute, `/api/jobs/${job.id}/approve`, { id: job.id }, {})) as { status: number; json: { error?: { fieldErrors?: Record<string, string[]> } } };
    expect(empty.status).toBe(400);
    expect(empty.json.error?.fieldErrors?.quoteVersion?.[0]).toMatch(/^Reload the page/);
    expect(getOwnerJob(owner, job.id).job.state).toBe("quoted");
    const someoneElse = await quotedRepairJob(studio);
    const theirs = await call(approveRoute, `/api/jobs/${someoneElse.job.id}/approve`, { id: someoneElse.job.id }, { quoteVersion: someoneElse.job.quoteVersion, totalMinor: someoneElse.job.totalMinor });
    expect(theirs.status).toBe(404);
    expect(sessions()).toBe(0);
    const stale = await call(approveRoute, `/api/jobs/${job.id}/approve`, { id: job.id }, { quoteVersion: job.quoteVersion - 1, totalMinor: job.totalMinor });
    expect(stale.status).toBe(409);
    expect(sessions()).toBe(0);
    expect((await call(approveRoute, `/api/jobs/${job.id}/approve`, { id: job.id }, { quoteVersion: job.quoteVersion, totalMinor: job.totalMinor })).status).toBe(200);
    expect(sessions()).toBe(1);
  });
});
