import { NextResponse } from "next/server";
import { getDb } from "@/db/client";

export const dynamic = "force-dynamic";

export function GET() {
  getDb().$client.prepare("SELECT 1").get();
  return NextResponse.json({ ok: true });
}
