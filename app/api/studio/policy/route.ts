import { route } from "@/lib/http/route";
import { createPolicyVersion, listPolicyVersions } from "@/lib/settings";
import { policyVersionSchema } from "@/lib/validation/settings";

/** Warranty policy versions, newest first (admins). */
export const GET = route({ roles: ["admin"] }, ({ actor }) => ({ versions: listPolicyVersions(actor) }));

/** A new version effective from a date; earlier versions and the pieces stamped with them stay as they are. */
export const POST = route({ roles: ["admin"], body: policyVersionSchema, status: 201 }, ({ actor, body }) => {
  const row = createPolicyVersion(actor, body);
  return { id: row.id, version: row.version, effectiveFrom: row.effectiveFrom };
});
