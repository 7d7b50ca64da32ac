// Runs once when the server starts: a bad configuration or an unmigrated database stops it here,
// with a message saying what to do, instead of failing on the first request.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  try {
    await import("./lib/env");
    const { getDb } = await import("./db/client");
    getDb();
  } catch (e) {
    console.error(`\n${e instanceof Error ? e.message : String(e)}\n`);
    process.exit(1);
  }
}
