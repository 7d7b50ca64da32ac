import { NextResponse } from "next/server";
import { z } from "zod";
import { route } from "@/lib/http/route";
import { setRemindersByToken } from "@/lib/reminders/unsubscribe";
import { linkTokenField, oneClickBodySchema } from "@/lib/validation/reminders";

// The List-Unsubscribe URL of every care e-mail (RFC 8058).
// POST with List-Unsubscribe=One-Click: the mail provider unsubscribes the owner with no cookies and no
// session; we answer 200, never a redirect. The signed token is the authority, so this route accepts
// cross-site POSTs (anyOrigin) — they are the point of one-click (a provider may send its Origin).
// GET (someone opened the URL): the confirmation page, where a button does it.

export const POST = route(
  { query: z.object({ t: linkTokenField }), body: oneClickBodySchema, bodyKind: "form", anyOrigin: true },
  ({ query }) => {
    setRemindersByToken(query.t, false, "one_click");
    return new NextResponse("Unsubscribed: no more care reminders or refresh offers will be sent to this address.\n", {
      status: 200,
      headers: { "content-type": "text/plain; charset=utf-8", "cache-control": "no-store" },
    });
  },
);

export const GET = route({}, ({ req }) => {
  const target = req.nextUrl.clone();
  target.pathname = "/unsubscribe";
  target.search = "";
  target.searchParams.set("t", (req.nextUrl.searchParams.get("t") ?? "").slice(0, 300));
  return NextResponse.redirect(target, 303);
});
