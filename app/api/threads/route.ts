import { NextResponse } from "next/server";
import { z } from "zod";
import { requireStaff, requireUser } from "@/lib/auth/guards";
import { parseJson, parseQuery, route } from "@/lib/http/route";
import { listInbox, postOwnerMessage } from "@/lib/messages/service";
import { inboxQuerySchema } from "@/lib/validation/messages";

export const dynamic = "force-dynamic";

/** The studio's inbox: `?view=waiting|mine|all|done|unmatched` (staff). */
export const GET = route(async (req) => NextResponse.json(listInbox(await requireStaff(), parseQuery(req, inboxQuerySchema))));

/** An owner writes about a claim, repair job or visit of theirs: `{ about, id, body }`. */
export const POST = route(async (req) => {
  const out = await postOwnerMessage(await requireUser(), await parseJson(req, z.unknown(), { limit: 64 * 1024 }));
  return NextResponse.json(out, { status: 201 });
});
