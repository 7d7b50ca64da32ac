import "server-only";
import { NextResponse } from "next/server";
import { SlotTakenError } from "./service";

/** Runs a booking or a move; a taken slot answers 409 with the error and fresh slots beside it. */
export async function withFreshSlots(fn: () => Promise<unknown>, status = 200): Promise<Response> {
  try {
    return NextResponse.json({ visit: await fn() }, { status });
  } catch (e) {
    if (e instanceof SlotTakenError) {
      return NextResponse.json({ error: { code: e.code, message: e.message }, slots: e.slots }, { status: 409 });
    }
    throw e;
  }
}
