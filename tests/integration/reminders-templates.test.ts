// Every care reminder renders for every task kind and step, with and without a refresh offer, without
// missing values; the plain-text parts are snapshotted (tests/integration/__snapshots__) — read them.
import { render } from "@react-email/render";
import { describe, expect, it } from "vitest";
import { careSchedule, type CatalogEntry } from "@/lib/care/schedule";
import { CARE_TASK_KINDS, REMINDER_STEPS, type CareTaskKind, type FinishClass } from "@/lib/care/vocabulary";
import { composeReminder, type ReminderMail } from "@/lib/reminders/compose";
import { refreshQuote } from "@/lib/reminders/pass";

const CLASS_FOR: Record<Exclude<CareTaskKind, "annual_check">, FinishClass> = {
  reoil: "hardwax_oil",
  topcoat_refresh: "ceramic_topcoat",
  rewax: "paste_wax",
  film_inspect: "film_finish",
  resin_polish: "epoxy_surface",
  reoil_charred: "charred_oiled",
};
const catalog: CatalogEntry[] = Object.values(CLASS_FOR).map((finishClass) => ({
  id: `p-${finishClass}`,
  name: `Example ${finishClass.replace("_", " ")} (invented)`,
  finishClass,
  coverageM2PerL: finishClass === "ceramic_topcoat" ? 186 : 20,
  containerSizesMl: [100, 500],
  containerPricesMinor: { 100: 1500, 500: 4500 },
}));
const studio = { id: "s", name: "Example Studio (invented)", timeZone: "America/Los_Angeles", currency: "USD", country: "US", taxRateBp: 850, labourRateMinor: 8500, travelFeeMinor: 4500 };
const pieceCols = {
  id: "piece-1", kind: "dining_table", use: "heavy", sun: "indirect", deliveredOn: "2025-03-02", resinKind: "deep_pour", primarySpeciesId: "black_walnut",
  shapeKind: "rectangle", lengthMm: 2200, widthMm: 1000, diameterMm: null, measuredAreaM2: null,
} as const;

function taskOf(kind: CareTaskKind) {
  const layers = kind === "annual_check" ? [] : [{ id: "l1", surface: "top" as const, finishClass: CLASS_FOR[kind], productId: `p-${CLASS_FOR[kind]}`, coats: 2, appliedOn: "2025-03-02" }];
  const s = careSchedule({ piece: { id: "piece-1", kind: "dining_table", use: "heavy", sun: "indirect", deliveredOn: "2025-03-02", resin: "deep_pour", shape: { kind: "rectangle", lengthMm: 2200, widthMm: 1000 } }, finishLayers: layers, careLog: [], catalog, now: "2025-04-01T12:00:00Z", timeZone: studio.timeZone });
  return s.tasks.find((t) => t.kind === kind)!;
}

const OWNER_TODAY = { before_14d: -14, due_day: 0, after_30d: 30 } as const;
const shift = (iso: string, days: number) => new Date(Date.parse(`${iso}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);

describe("care reminder templates", () => {
  for (const kind of CARE_TASK_KINDS) {
    for (const step of REMINDER_STEPS) {
      it(`${kind} · ${step}`, async () => {
        const task = taskOf(kind);
        const product = task.productId ? catalog.find((c) => c.id === task.productId) : undefined;
        const q = step === "before_14d" ? refreshQuote(task, pieceCols, studio, product) : undefined;
        const mail: ReminderMail = {
          reminderKey: `${task.key}:${task.dueOn}:${step}`,
          step,
          task,
          owner: { id: "owner-1", email: "owner@owners.example", name: "Robin Example", unitSystem: kind === "rewax" ? "metric" : "imperial" },
          piece: { id: "piece-1", title: "Walnut river table (invented)", use: "heavy", sun: "indirect", shape: { kind: "rectangle", lengthMm: 2200, widthMm: 1000 }, hasResin: true },
          studio: { name: studio.name, country: studio.country },
          product,
          offer: q ? { id: "offer-1", quote: q } : undefined,
          ownerToday: shift(task.dueOn, OWNER_TODAY[step]),
        };
        const input = composeReminder(mail);
        const text = await render(input.email, { plainText: true });
        const html = await render(input.email);
        for (const part of [text, html, input.subject]) expect(part).not.toMatch(/undefined|NaN|\[object Object\]|null/);
        expect(input.headers?.["List-Unsubscribe-Post"]).toBe("List-Unsubscribe=One-Click");
        expect(text).toContain("/unsubscribe?t=");
        const oil = ["reoil", "topcoat_refresh", "reoil_charred"].includes(kind);
        expect(text.includes("Oily rags can catch fire by themselves")).toBe(oil);
        expect(text.includes("Accept the refresh offer")).toBe(q !== undefined);
        if (["reoil", "topcoat_refresh", "rewax", "resin_polish", "reoil_charred"].includes(kind)) expect(text).toMatch(/How much: About/);
        expect(`Subject: ${input.subject}\n\n${text.replace(/t=[A-Za-z0-9_-]+\.[A-Za-z0-9_-]+/g, "t=TOKEN")}`).toMatchSnapshot();
      });
    }
  }
});
