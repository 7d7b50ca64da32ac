import "server-only";
import { notFound, redirect } from "next/navigation";
import { headers } from "next/headers";
import { isAppError } from "@/lib/errors";
import { homePathFor } from "./guards";
import { getCurrentSession } from "./session";

/**
 * Runs a lib/ call for a page and turns its access errors into navigation: not signed in → the
 * sign-in page (coming back here after), not allowed → the person's own home, not found → 404.
 */
export async function forPage<T>(fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (e) {
    if (!isAppError(e)) throw e;
    if (e.status === 401) {
      const path = (await headers()).get("x-grainward-path") ?? "/";
      redirect(`/sign-in?next=${encodeURIComponent(path)}`);
    }
    if (e.status === 403) {
      const { user } = await getCurrentSession();
      redirect(`${user ? await homePathFor(user.id) : "/"}?denied=1`);
    }
    if (e.status === 404) notFound();
    throw e;
  }
}
