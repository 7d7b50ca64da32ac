// Care tasks a running plan includes are the studio's work, not the owner's: the reminder pass leaves them out.
import { and, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { planSubscriptions, planTemplates } from "@/db/schema";
import type { CareTaskKind } from "@/lib/care/vocabulary";
import { PLAN_COVERS } from "./states";

/** For each of the pieces under a plan that covers now, the care tasks its plan includes. */
export function planIncludedTasks(pieceIds: readonly string[]): Map<string, Set<CareTaskKind>> {
  const out = new Map<string, Set<CareTaskKind>>();
  if (pieceIds.length === 0) return out;
  const rows = getDb()
    .select({ pieceId: planSubscriptions.pieceId, included: planTemplates.included })
    .from(planSubscriptions)
    .innerJoin(planTemplates, eq(planTemplates.id, planSubscriptions.templateId))
    .where(and(inArray(planSubscriptions.pieceId, [...pieceIds]), inArray(planSubscriptions.state, [...PLAN_COVERS])))
    .all();
  for (const r of rows) out.set(r.pieceId, new Set([...(out.get(r.pieceId) ?? []), ...r.included.tasks]));
  return out;
}
