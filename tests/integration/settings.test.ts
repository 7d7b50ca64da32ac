// Studio settings: profile and rates in minor units, reminder timing, visit booking rules, e-mail
// previews, the audit log.
// All data invented.
import fs from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { ZodError } from "zod";
import { getDb } from "@/db/client";
import { auditLog, memberships, studios } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { profileFormValues, reminderTiming, toMinorUnits, updateProfile, updateReminderTiming, updateVisitRules, visitRules } from "@/lib/settings";
import { listEmailTemplates, renderEmailPreview } from "@/lib/settings/email-previews";
import { listAudit } from "@/lib/studio/audit";
import { auditQuerySchema } from "@/lib/studio/audit-query";
import { changeMemberRole } from "@/lib/studio/team";
import { bookVisit } from "@/lib/visits/book";
import { profileSchema, reminderTimingSchema, visitRulesSchema } from "@/lib/validation/settings";
import { listJobSlots } from "@/lib/visits/slots";
import { createStudio, memberContext } from "../support/fixtures";
import { addJob, ownerActor, staffActor, visitWorld } from "./visits-helpers";

const profile = {
  name: "Settings Studio (invented)",
  address: "1 Invented Lane",
  email: "",
  timeZone: "Europe/Berlin",
  currency: "USD" as const,
  unitSystem: "imperial" as const,
  taxRatePct: "8.25",
  labourRate: "85.5",
  travelFee: "45",
};

function status(fn: () => unknown): number | string {
  try {
    fn();
    return "no error";
  } catch (e) {
    return e instanceof AppError ? e.status : e instanceof ZodError ? "zod" : String(e);
  }
}

describe("studio profile and rates", () => {
  it("stores amounts in the currency's minor units and reads them back as typed", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    updateProfile(admin, profile);
    const row = getDb().select().from(studios).where(eq(studios.id, studio.id)).get()!;
    expect([row.taxRateBp, row.labourRateMinor, row.travelFeeMinor, row.timeZone, row.unitSystem]).toEqual([825, 8550, 4500, "Europe/Berlin", "imperial"]);
    expect(profileFormValues({ ...admin, studio: row })).toMatchObject({ taxRatePct: "8.25", labourRate: "85.50", travelFee: "45.00" });

    updateProfile(admin, { ...profile, currency: "JPY", labourRate: "9000", travelFee: "0" });
    const yen = getDb().select().from(studios).where(eq(studios.id, studio.id)).get()!;
    expect([yen.currency, yen.labourRateMinor]).toEqual(["JPY", 9000]);
    const audit = getDb().select().from(auditLog).where(eq(auditLog.subjectId, studio.id)).all();
    expect(audit.map((a) => a.action)).toEqual(["settings.profile_updated", "settings.profile_updated"]);
    expect(audit[1]!.data).toMatchObject({ changed: { currency: { from: "USD", to: "JPY" } } });
  });

  it("refuses amounts the currency can't hold, bad zones and non-admins", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const staff = await memberContext(studio, "staff");
    expect(status(() => updateProfile(admin, profileSchema.parse({ ...profile, currency: "JPY", labourRate: "12.5" })))).toBe("zod");
    expect(status(() => updateProfile(admin, profileSchema.parse({ ...profile, timeZone: "Mars/Olympus" })))).toBe("zod");
    expect(status(() => updateProfile(admin, profileSchema.parse({ ...profile, taxRatePct: "101" })))).toBe("zod");
    expect(status(() => updateProfile(admin, profileSchema.parse({ ...profile, labourRate: "$85" })))).toBe("zod");
    expect(status(() => updateProfile(admin, profileSchema.parse({ ...profile, currency: "XYZ" })))).toBe("zod");
    expect(status(() => updateProfile(staff, profile))).toBe(403);
    expect(getDb().select().from(studios).where(eq(studios.id, studio.id)).get()!.name).toBe("Test Studio (invented)");
    expect(toMinorUnits("0.05", "USD")).toBe(5);
    expect(toMinorUnits("120", "USD")).toBe(12000);
  });
});

describe("reminder timing", () => {
  it("saves the hour and the steps in their order", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    expect(reminderTiming(admin)).toEqual({ sendHour: 9, steps: ["before_14d", "due_day", "after_30d"] });
    updateReminderTiming(admin, { sendHour: 18, steps: ["after_30d", "before_14d"] });
    expect(reminderTiming(admin)).toEqual({ sendHour: 18, steps: ["before_14d", "after_30d"] });
    updateReminderTiming(admin, { sendHour: 7, steps: [] });
    expect(reminderTiming(admin)).toEqual({ sendHour: 7, steps: [] });
    expect(status(() => updateReminderTiming(admin, reminderTimingSchema.parse({ sendHour: 24, steps: [] })))).toBe("zod");
    expect(status(() => updateReminderTiming(admin, reminderTimingSchema.parse({ sendHour: 9, steps: ["weekly"] })))).toBe("zod");
    const tech = await memberContext(studio, "technician");
    expect(status(() => updateReminderTiming(tech, { sendHour: 9, steps: [] }))).toBe(403);
  });
});

describe("visit booking rules", () => {
  const DEFAULTS = { travelBufferMin: 30, leadTimeHours: 48, slotStepMin: 30, ownerChangeCutoffHours: 24 };

  it("start from the defaults, save as typed, are checked, audited and admin-only", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    expect(visitRules(admin)).toEqual(DEFAULTS);
    const mine = { travelBufferMin: 45, leadTimeHours: 24, slotStepMin: 60, ownerChangeCutoffHours: 12 };
    expect(updateVisitRules(admin, mine)).toEqual(mine);
    expect(visitRules(admin)).toEqual(mine);
    const other = await memberContext(createStudio(), "admin");
    expect(visitRules(other)).toEqual(DEFAULTS); // one studio's rules are its own
    for (const bad of [{ leadTimeHours: 337 }, { leadTimeHours: -1 }, { travelBufferMin: 241 }, { travelBufferMin: 1.5 }, { slotStepMin: 20 }, { ownerChangeCutoffHours: 169 }, { leadTimeHours: "48" }]) {
      expect(status(() => updateVisitRules(admin, visitRulesSchema.parse({ ...mine, ...bad }))), JSON.stringify(bad)).toBe("zod");
    }
    expect(visitRules(admin)).toEqual(mine); // a refused change leaves the saved rules alone
    for (const role of ["staff", "technician"] as const) {
      const ctx = await memberContext(studio, role);
      expect(status(() => updateVisitRules(ctx, mine))).toBe(403);
    }
    const audit = getDb().select().from(auditLog).where(eq(auditLog.studioId, studio.id)).all().filter((a) => a.action === "settings.visit_rules_updated");
    expect(audit).toHaveLength(1);
    expect(audit[0]!.data).toEqual({ from: DEFAULTS, to: mine });
  });

  it("shape the slots offered: the owner's notice, the spacing of start times and the buffer around a booked visit", async () => {
    // Monday 2027-05-10 08:00 in New York; the technician works weekdays 09:00–17:00 there.
    const NOW = Date.parse("2027-05-10T12:00:00Z");
    const w = await visitWorld();
    const admin = await memberContext(w.studio, "admin");
    const window = { from: "2027-05-10T00:00:00Z", to: "2027-05-15T00:00:00Z" };
    const slots = (actor = ownerActor(w.owner)) => listJobSlots(actor, w.job.id, window, NOW).slots;
    const set = (over: Partial<typeof DEFAULTS>) => updateVisitRules(admin, { ...DEFAULTS, ...over });

    expect(slots()[0]!.start).toBe("2027-05-12T13:00:00.000Z"); // 48 h notice: Wednesday 09:00 EDT
    set({ leadTimeHours: 72 });
    expect(slots()[0]!.start).toBe("2027-05-13T13:00:00.000Z"); // Thursday 09:00 EDT
    expect(slots(staffActor(w.staff))[0]!.start).toBe("2027-05-10T13:00:00.000Z"); // staff are not held to the owners' notice
    set({ leadTimeHours: 0 });
    expect(slots()[0]!.start).toBe("2027-05-10T13:00:00.000Z");

    const minutes = (list: { start: string }[]) => new Set(list.map((s) => new Date(s.start).getUTCMinutes()));
    expect([...minutes(slots())].sort((a, b) => a - b)).toEqual([0, 30]);
    set({ leadTimeHours: 0, slotStepMin: 60 });
    expect([...minutes(slots())]).toEqual([0]);
    set({ leadTimeHours: 0, slotStepMin: 15 });
    expect([...minutes(slots())].sort((a, b) => a - b)).toEqual([0, 15, 30, 45]);

    // One visit booked first thing Monday; the next slot that day leaves the buffer clear after it.
    const first = slots()[0]!;
    const booked = await bookVisit(ownerActor(w.owner), { jobId: w.job.id, technicianId: first.technicianId, start: first.start }, NOW);
    const end = Date.parse(booked.end);
    const w2 = addJob(w.studio, w.piece.id, w.owner.id, w.product.id);
    const nextAfter = (buffer: number) => {
      set({ leadTimeHours: 0, slotStepMin: 15, travelBufferMin: buffer });
      return listJobSlots(ownerActor(w.owner), w2.id, window, NOW).slots.find((s) => Date.parse(s.start) >= end)!.start;
    };
    expect(Date.parse(nextAfter(0)) - end).toBe(0);
    expect(Date.parse(nextAfter(60)) - end).toBe(60 * 60_000);
  });
});

describe("e-mail previews", () => {
  it("renders every template with its invented example values, HTML and plain text", async () => {
    const admin = await memberContext(createStudio(), "admin");
    const templates = listEmailTemplates(admin);
    expect(templates.length).toBeGreaterThanOrEqual(12);
    for (const t of templates) {
      const p = await renderEmailPreview(admin, t.slug);
      expect(p.html, t.slug).toMatch(/<html/i);
      expect(p.html, t.slug).not.toMatch(/<script/i);
      expect(p.text.length, t.slug).toBeGreaterThan(40);
      // A date reads as the real mail writes it (lib/format), never as a stored "2026-02-02" (links aside).
      expect(p.text.replace(/https?:\/\/\S+/g, ""), t.slug).not.toMatch(/\b\d{4}-\d{2}-\d{2}\b/);
    }
    // Every template with example values (emails/*.tsx, PreviewProps) can be previewed, under its file's name.
    const withExamples = fs.readdirSync(path.join(process.cwd(), "emails")).filter((f) => f.endsWith(".tsx") && fs.readFileSync(path.join(process.cwd(), "emails", f), "utf8").includes(".PreviewProps =")).map((f) => f.replace(/\.tsx$/, ""));
    expect(withExamples.filter((slug) => !templates.some((t) => t.slug === slug))).toEqual([]);
    const reminder = await renderEmailPreview(admin, "care-reminder");
    expect(reminder.text).toContain("Walnut river dining table");
    await expect(renderEmailPreview(admin, "nope")).rejects.toMatchObject({ status: 404 });
    const staff = await memberContext(createStudio(), "staff");
    await expect(renderEmailPreview(staff, "care-reminder")).rejects.toMatchObject({ status: 403 });
  });
});

describe("audit log", () => {
  it("lists who did what, filters by kind and person, and stays inside the studio", async () => {
    const studio = createStudio({ timeZone: "America/New_York" });
    const admin = await memberContext(studio, "admin");
    const staff = await memberContext(studio, "staff");
    const m = getDb().select().from(memberships).where(eq(memberships.userId, staff.user.id)).get()!;
    changeMemberRole(admin, { membershipId: m.id, role: "technician" });
    updateReminderTiming(admin, { sendHour: 10, steps: ["due_day"] });
    getDb().insert(auditLog).values({ studioId: studio.id, actorId: staff.user.id, action: "payment.refunded", subjectType: "payment", subjectId: "p1", data: { amountMinor: 500 }, createdAt: new Date("2026-03-04T19:05:00Z") }).run();

    const all = listAudit(staff, auditQuerySchema.parse({}));
    expect(all.total).toBe(3);
    expect(all.rows.map((r) => r.label)).toEqual(["Reminder timing changed", "Role changed", "Refund issued"]);
    expect(all.rows[1]!.details).toContain("staff → technician");
    // 19:05 UTC is 14:05 in New York (EST, UTC−5 in March before the 8 March 2026 change); the zone is named.
    expect(all.rows[2]!.local).toBe("4 March 2026 at 14:05 EST");

    expect(listAudit(staff, auditQuerySchema.parse({ group: "team" })).rows.map((r) => r.action)).toEqual(["member.role_changed"]);
    expect(listAudit(staff, auditQuerySchema.parse({ group: "payments" })).rows.map((r) => r.action)).toEqual(["payment.refunded"]);
    expect(listAudit(staff, auditQuerySchema.parse({ actor: staff.user.id })).total).toBe(1);
    expect(listAudit(staff, auditQuerySchema.parse({ from: "2026-03-04", to: "2026-03-04" })).total).toBe(1);
    expect(listAudit(staff, auditQuerySchema.parse({ from: "2026-03-05", to: "2026-03-05" })).total).toBe(0);
    expect(status(() => listAudit(staff, auditQuerySchema.parse({ from: "2026-03-05", to: "2026-03-01" })))).toBe("zod");
    expect(status(() => listAudit(staff, auditQuerySchema.parse({ group: "everything" })))).toBe("zod");

    const other = await memberContext(createStudio(), "admin");
    expect(listAudit(other, auditQuerySchema.parse({})).total).toBe(0);
    const tech = await memberContext(studio, "technician");
    expect(status(() => listAudit(tech, auditQuerySchema.parse({})))).toBe(403);
  });
});
