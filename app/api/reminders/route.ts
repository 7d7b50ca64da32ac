import { route } from "@/lib/http/route";
import { listLedger, listUpcoming } from "@/lib/reminders/staff";
import { remindersQuerySchema } from "@/lib/validation/reminders";

export const dynamic = "force-dynamic";

/** GET ?view=upcoming|ledger&status=&kind=&step=&q=&days= — the staff reminders view's data. */
export const GET = route({ roles: ["admin", "staff"], query: remindersQuerySchema }, ({ actor, query }) =>
  query.view === "upcoming" ? { view: "upcoming", rows: listUpcoming(actor, query) } : { view: "ledger", rows: listLedger(actor, query) },
);
