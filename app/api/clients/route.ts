import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { createClient } from "@/lib/clients/create";
import { listClients } from "@/lib/clients/list";
import { parseJson, parseQuery, route } from "@/lib/http/route";
import { clientListQuerySchema, createClientSchema } from "@/lib/validation/clients";

export const dynamic = "force-dynamic";

/** The studio's clients: ?q= (name, e-mail, phone digits, piece title), filter=, sort=, dir=, page= (50 a page). */
export const GET = route(async (req) => {
  const ctx = await requireStaff();
  return NextResponse.json(listClients(ctx, parseQuery(req, clientListQuerySchema)));
});

export const POST = route(async (req) => {
  const ctx = await requireStaff();
  const body = await parseJson(req, createClientSchema);
  return NextResponse.json({ client: createClient(ctx, body) }, { status: 201 });
});
