// One competitor in the concurrency test: its own process and its own SQLite connection. Waits for the
// shared start signal, tries to book, prints {"status": 201 | 409 | …} and exits.
import { getDb } from "@/db/client";
import { AppError } from "@/lib/errors";
import { reserveVisit } from "@/lib/visits/core";

const [studioId, jobId, technicianId, start, now, goAt] = process.argv.slice(2) as [string, string, string, string, string, string];
const db = getDb();
while (Date.now() < Number(goAt)) await new Promise((r) => setTimeout(r, 1));
let status = 0;
try {
  reserveVisit(db, { studioId, jobId, technicianId, startMs: Date.parse(start), leadTimeHours: 0, actorId: null, now: Number(now) });
  status = 201;
} catch (e) {
  status = e instanceof AppError ? e.status : 500;
  if (status === 500) console.error(e);
}
process.stdout.write(JSON.stringify({ status }));
db.$client.close();
