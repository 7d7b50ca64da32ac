// Hand-written SQL of lib/claims, kept in one place: a correlated count the list queries select per row
// (served by the files (claim_id) index) instead of a GROUP BY over a join.
import { sql } from "drizzle-orm";
import { claims, files } from "@/db/schema";

export const photoCountSql = sql<number>`(select count(*) from ${files} where ${files.claimId} = ${claims.id} and ${files.purpose} = 'claim_photo')`;
