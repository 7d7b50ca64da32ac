import "server-only";
import type { User } from "lucia";
import { requireStaff, requireUser, type StudioContext } from "@/lib/auth/guards";
import { isAppError } from "@/lib/errors";

/**
 * Who is looking at claims: always a signed-in user; `staff` when they are admin or staff of their
 * current studio. A claim is visible to its owner and to that studio's staff, to nobody else.
 */
export type ClaimViewer = { user: Pick<User, "id" | "name" | "email">; staff: StudioContext | null };

export async function currentViewer(): Promise<ClaimViewer> {
  const user = await requireUser();
  try {
    return { user, staff: await requireStaff() };
  } catch (e) {
    if (isAppError(e) && e.status === 403) return { user, staff: null };
    throw e;
  }
}

export function ownerViewer(user: Pick<User, "id" | "name" | "email">): ClaimViewer {
  return { user, staff: null };
}

export function staffViewer(ctx: StudioContext): ClaimViewer {
  return { user: ctx.user, staff: ctx };
}
