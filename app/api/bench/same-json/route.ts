import fs from "node:fs";
import { NextResponse } from "next/server";

// The floor `npm run bench` compares GET /api/pieces with: a route handler that does no session check
// and no query, and serializes the same JSON body (read once from GRAINWARD_BENCH_JSON). Without that
// variable — everywhere but a benchmark run — it does not exist.
export const dynamic = "force-dynamic";

let body: unknown;

export function GET() {
  const file = process.env.GRAINWARD_BENCH_JSON;
  if (!file) return NextResponse.json({ error: { code: "not_found", message: "Not found." } }, { status: 404 });
  body ??= JSON.parse(fs.readFileSync(file, "utf8"));
  return NextResponse.json(body);
}
