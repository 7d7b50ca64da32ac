import { NextResponse } from "next/server";
import { checkHealth } from "@/lib/health";

export const dynamic = "force-dynamic";

export function GET() {
  return NextResponse.json(checkHealth());
}
