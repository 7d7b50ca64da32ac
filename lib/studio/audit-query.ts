// The audit log's filters: also its URL's query string. Pure, for the page and the route.
import { z } from "zod";
import { filterDate } from "@/lib/validation/dates";

/** Filter groups and the action prefixes each covers. */
export const AUDIT_GROUPS = {
  claims: { label: "Claims and decisions", prefixes: ["claim."] },
  layers: { label: "Finish layers", prefixes: ["layer."] },
  pieces: { label: "Pieces and photos", prefixes: ["piece.", "pieces.", "photo."] },
  care: { label: "Care log", prefixes: ["care_log."] },
  jobs: { label: "Repair jobs", prefixes: ["job.", "refresh_offer."] },
  payments: { label: "Payments and refunds", prefixes: ["payment.", "job.paid"] },
  team: { label: "Team and roles", prefixes: ["member."] },
  settings: { label: "Settings, warranty, catalog", prefixes: ["settings.", "policy.", "finish_product."] },
} as const;
export type AuditGroup = keyof typeof AUDIT_GROUPS;

export const auditQuerySchema = z.preprocess(
  (raw) => (raw && typeof raw === "object" ? Object.fromEntries(Object.entries(raw).filter(([, v]) => v !== "" && v != null)) : raw),
  z
    .object({
      group: z.enum(Object.keys(AUDIT_GROUPS) as [AuditGroup, ...AuditGroup[]], { error: "Pick a kind of change from the list." }).optional(),
      actor: z.string().trim().max(64).optional(),
      from: filterDate().optional(),
      to: filterDate().optional(),
      page: z.coerce.number({ error: "Page must be a number." }).int().min(1).max(10_000).default(1),
    })
    .refine((q) => !q.from || !q.to || q.from <= q.to, { message: "The period must start on or before its end.", path: ["to"] }),
);
export type AuditQuery = z.output<typeof auditQuerySchema>;
