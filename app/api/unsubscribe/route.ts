import { NextResponse, type NextRequest } from "next/server";
import { z } from "zod";
import { errorResponse } from "@/lib/http/route";
import { badRequest, isAppError } from "@/lib/errors";
import { BODY_LIMITS, readForm } from "@/lib/http/body";
import { setRemindersByToken } from "@/lib/reminders/unsubscribe";
import { linkTokenField, oneClickBodySchema } from "@/lib/validation/reminders";

// The List-Unsubscribe URL of every care e-mail (RFC 8058).
// POST with List-Unsubscribe=One-Click: the mail provider unsubscribes the owner with no cookies and no
// session; we answer 200, never a redirect. The signed token is the authority, so unlike route() this
// handler accepts cross-site POSTs — they are the point of one-click (a provider may send its Origin).
// GET (someone opened the URL): the confirmation page, where a button does it.

async function formBody(req: NextRequest): Promise<Record<string, string>> {
  const form = await readForm(req, BODY_LIMITS.form, ["urlencoded", "multipart"]);
  return Object.fromEntries([...form.entries()].map(([k, v]) => [k, typeof v === "string" ? v : ""]));
}

export async function POST(req: NextRequest): Promise<Response> {
  try {
    oneClickBodySchema.parse(await formBody(req));
    const token = linkTokenField.parse(req.nextUrl.searchParams.get("t") ?? "");
    setRemindersByToken(token, false, "one_click");
    return new NextResponse("Unsubscribed: no more care reminders or refresh offers will be sent to this address.\n", {
      status: 200,
      headers: { "content-type": "text/plain; charset=utf-8", "cache-control": "no-store" },
    });
  } catch (e) {
    if (isAppError(e)) return errorResponse(e);
    if (e instanceof z.ZodError) return errorResponse(badRequest(z.flattenError(e).formErrors[0] ?? e.issues[0]?.message ?? "Bad request."));
    console.error(e);
    return NextResponse.json({ error: { code: "internal", message: "Something went wrong on our side." } }, { status: 500 });
  }
}

export function GET(req: NextRequest): Response {
  const target = req.nextUrl.clone();
  target.pathname = "/unsubscribe";
  target.search = "";
  target.searchParams.set("t", (req.nextUrl.searchParams.get("t") ?? "").slice(0, 300));
  return NextResponse.redirect(target, 303);
}
