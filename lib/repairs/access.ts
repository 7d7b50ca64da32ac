import "server-only";
import type { User } from "lucia";
import { requireStaff, requireUser, studioMemberships, type StudioContext } from "@/lib/auth/guards";

export type JobActor = { ctx: StudioContext; owner?: undefined } | { ctx?: undefined; owner: User };

/** Staff act on the studio's jobs; everyone else on their own. */
export async function requireJobActor(): Promise<JobActor> {
  const user = await requireUser();
  const staff = (await studioMemberships(user.id)).some((m) => m.role === "admin" || m.role === "staff");
  return staff ? { ctx: await requireStaff() } : { owner: user };
}
