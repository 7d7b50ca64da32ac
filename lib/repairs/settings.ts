import "server-only";
// The studio's repair price list, rounding rule and tax settings (the "Repair prices and tax" section).
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { studios, type Studio } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioContext } from "@/lib/auth/guards";
import { formatMinorUnits } from "@/lib/care/quote";
import { AppError, badRequest } from "@/lib/errors";
import { formatBasisPoints } from "@/lib/format";
import { assertAdmin, freshStudio, toBasisPoints, toMinorUnits } from "@/lib/settings";
import { repairSettingsSchema, type RepairSettingsInput } from "@/lib/validation/repair-settings";
import { LINE_KINDS, type PriceListEntry } from "./lines";
import { entrySurface, priceListOf } from "./price-list";
import { inWords } from "@/lib/validation/words";

/** The form's values from what the studio has saved. */
export function repairSettingsValues(ctx: StudioContext): RepairSettingsInput & { singleRatePct: string; currency: string } {
  assertAdmin(ctx);
  const s = freshStudio(ctx);
  return {
    roundingRule: s.roundingRule,
    taxMode: s.taxMode,
    taxInclusive: s.taxInclusive,
    taxRates: Object.fromEntries(LINE_KINDS.map((k) => [k, formatBasisPoints(s.taxRatesBp[k] ?? 0)])) as RepairSettingsInput["taxRates"],
    taxNumber: s.taxNumber,
    priceList: priceListOf(s).map((e) => ({ key: e.key, label: e.label, kind: e.kind, unit: e.unit, surface: entrySurface(e), price: e.unitPriceMinor === null ? "" : formatMinorUnits(e.unitPriceMinor, s.currency) })),
    singleRatePct: formatBasisPoints(s.taxRateBp),
    currency: s.currency,
  };
}

/** A key for a new task from its name: "Leg re-glue" → "leg_re_glue"; made unique within the list. */
function keyFor(label: string, taken: Set<string>): string {
  const base = label.toLowerCase().replace(/[^a-z0-9]+/g, "_").replace(/^_|_$/g, "").slice(0, 48) || "task";
  let key = base;
  for (let n = 2; taken.has(key); n++) key = `${base}_${n}`;
  taken.add(key);
  return key;
}

/** Saves the repair price list, rounding and tax; quotes priced from now on follow them (sent quotes keep theirs). */
export function updateRepairSettings(ctx: StudioContext, raw: RepairSettingsInput): Studio {
  assertAdmin(ctx);
  const input = repairSettingsSchema.parse(raw, { error: inWords });
  const s = freshStudio(ctx);
  const taken = new Set<string>();
  const list: PriceListEntry[] = input.priceList.map((e) => {
    const key = e.key && !taken.has(e.key) ? (taken.add(e.key), e.key) : keyFor(e.label, taken);
    let unitPriceMinor: number | null = null;
    if (e.price !== "") {
      try {
        unitPriceMinor = toMinorUnits(e.price, s.currency);
      } catch (err) {
        const why = err instanceof AppError ? err.message : "that is not a price.";
        throw badRequest(`${e.label}: ${why}`, { priceList: [`${e.label}: ${why}`] });
      }
    }
    return { key, label: e.label, kind: e.kind, unit: e.unit, unitPriceMinor, ...(e.surface ? { surface: e.surface } : {}) };
  });
  const ratesBp = Object.fromEntries(LINE_KINDS.map((k) => [k, toBasisPoints(input.taxRates[k])]));
  return getDb().transaction((tx) => {
    const updated = tx
      .update(studios)
      .set({ roundingRule: input.roundingRule, taxMode: input.taxMode, taxInclusive: input.taxInclusive, taxRatesBp: ratesBp, taxNumber: input.taxNumber, repairPriceList: list })
      .where(eq(studios.id, s.id))
      .returning()
      .get()!;
    recordAudit(tx, { studioId: s.id, actorId: ctx.user.id, action: "settings.repair_prices_updated", subjectType: "studio", subjectId: s.id, data: { rounding: input.roundingRule, taxMode: input.taxMode, taxInclusive: input.taxInclusive, tasks: list.length } });
    return updated;
  });
}
