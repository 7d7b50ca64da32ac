// One competitor in the plan checkout concurrency test: its own process and its own SQLite connection.
// Waits for the shared start signal, starts a plan checkout for the piece, prints
// {"status": 200 | 409 | …, "url"?, "message"?} and exits.
import { getDb } from "@/db/client";
import { AppError } from "@/lib/errors";
import { startPlanCheckout } from "@/lib/plans/subscriptions";

const [userId, email, name, pieceId, templateId, goAt] = process.argv.slice(2) as [string, string, string, string, string, string];
const db = getDb();
while (Date.now() < Number(goAt)) await new Promise((r) => setTimeout(r, 1));
let out: { status: number; url?: string; message?: string };
try {
  const { checkoutUrl } = await startPlanCheckout({ id: userId, email, name }, pieceId, templateId);
  out = { status: 200, url: checkoutUrl };
} catch (e) {
  out = e instanceof AppError ? { status: e.status, message: e.message } : { status: 500, message: String(e) };
  if (out.status === 500) console.error(e);
}
process.stdout.write(JSON.stringify(out));
db.$client.close();
