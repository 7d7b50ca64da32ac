import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { studios } from "@/db/schema";
import { brandOf, type StudioBrand } from "./brand";

/** A studio's brand for its owners' pages and PDFs (logo path root-relative unless `base` is given). */
export function studioBrand(studioId: string, base = ""): StudioBrand | null {
  const s = getDb().select({ id: studios.id, name: studios.name, logoKey: studios.logoKey, accent: studios.accent }).from(studios).where(eq(studios.id, studioId)).get();
  return s ? brandOf(s, base) : null;
}
