import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { parseQuery, route } from "@/lib/http/route";
import { listLedger, listUpcoming } from "@/lib/reminders/staff";
import { remindersQuerySchema } from "@/lib/validation/reminders";

export const dynamic = "force-dynamic";

/** GET ?view=upcoming|ledger&status=&kind=&step=&q=&days= — the staff reminders view's data. */
export const GET = route(async (req) => {
  const query = parseQuery(req, remindersQuerySchema);
  const ctx = await requireStaff();
  return NextResponse.json(query.view === "upcoming" ? { view: "upcoming", rows: listUpcoming(ctx, query) } : { view: "ledger", rows: listLedger(ctx, query) });
});
