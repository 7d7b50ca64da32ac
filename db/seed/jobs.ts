// Invented demo repair jobs, one in each state, on pieces the demo owners already hold. Prices come
// from the care engine through lib/repairs/pricing, like any job's.
import { and, eq, isNotNull } from "drizzle-orm";
import type { CareTaskKind } from "@/lib/care/vocabulary";
import { defaultProductIds, priceJob, pricedPiece, totals } from "@/lib/repairs/pricing";
import type { Db } from "../client";
import { finishProducts, payments, pieces, repairJobs, studios, type RepairJob } from "../schema";

type Spec = { piece: string; title: string; tasks: CareTaskKind[]; state: RepairJob["state"]; coveredPct?: number };

const SPECS: Spec[] = [
  { piece: "Cherry writing desk", title: "Re-wax the desk top", tasks: ["rewax"], state: "quoted" },
  { piece: "Spalted maple coffee table, blue resin", title: "Re-oil the maple top", tasks: ["reoil"], state: "approved" },
  { piece: "White oak kitchen island top", title: "Inspect the island's film finish", tasks: ["film_inspect"], state: "draft" },
  { piece: "Walnut river dining table", title: "Topcoat refresh, dining table", tasks: ["topcoat_refresh"], state: "paid" },
  { piece: "Walnut and maple resin coffee table", title: "Polish the resin river", tasks: ["resin_polish"], state: "covered", coveredPct: 100 },
  { piece: "Charred cedar garden bench", title: "Re-oil the charred bench", tasks: ["reoil_charred"], state: "done" },
];

export function seedJobs(db: Db, studioId: string, today: Date): Record<string, string> {
  const studio = db.select().from(studios).where(eq(studios.id, studioId)).get()!;
  const products = db.select().from(finishProducts).where(eq(finishProducts.studioId, studioId)).all();
  const owned = db.select().from(pieces).where(and(eq(pieces.studioId, studioId), isNotNull(pieces.ownerId))).all();
  const ids: Record<string, string> = {};
  const day = 24 * 3600 * 1000;
  db.transaction((tx) => {
    SPECS.forEach((spec, i) => {
      const piece = owned.find((p) => p.title === spec.piece);
      if (!piece) return;
      const input = {
        title: spec.title,
        tasks: spec.tasks,
        productIds: defaultProductIds(spec.tasks, products),
        coats: 1,
        travel: true,
        coveredPct: spec.coveredPct ?? 0,
        notes: "",
      };
      const priced = totals(priceJob(studio, pricedPiece(tx, piece), input, products));
      const at = new Date(today.getTime() - (20 - i * 3) * day);
      const sent = spec.state !== "draft";
      const job = tx
        .insert(repairJobs)
        .values({
          studioId,
          pieceId: piece.id,
          ownerId: piece.ownerId,
          origin: "studio",
          title: spec.title,
          quoteInput: input,
          currency: studio.currency,
          coveredPct: input.coveredPct,
          ...priced,
          state: spec.state,
          quoteVersion: sent ? 1 : 0,
          quotedAt: sent ? at : null,
          approvedAt: ["approved", "paid", "done"].includes(spec.state) ? at : null,
          paidAt: ["paid", "done"].includes(spec.state) ? at : null,
          doneAt: spec.state === "done" ? at : null,
          notes: "Invented demo job.",
        })
        .returning()
        .get();
      ids[spec.state] = job.id;
      if (spec.state === "paid" || spec.state === "done") {
        tx.insert(payments)
          .values({ studioId, jobId: job.id, quoteVersion: 1, checkoutSessionId: `cs_demo_seeded_${i}`, amountMinor: job.totalMinor, currency: job.currency, status: "paid", paymentIntentId: `pi_demo_seeded_${i}`, paidAt: at })
          .run();
      }
    });
  });
  return ids;
}
