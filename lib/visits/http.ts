import "server-only";
import { NextResponse } from "next/server";

/**
 * Runs a booking or a move and answers the visit. A taken slot is a 409 whose JSON carries fresh
 * slots beside the error (lib/visits/slots.ts refusedWithSlots puts them on the AppError; lib/http/route.ts answers it).
 */
export async function withFreshSlots(fn: () => Promise<unknown>, status = 200): Promise<Response> {
  return NextResponse.json({ visit: await fn() }, { status });
}
