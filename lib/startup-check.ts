// Called once by instrumentation.ts in the Node.js runtime: stops the server at start when the
// configuration is invalid or the database is not migrated.
export async function checkStartup(): Promise<void> {
  try {
    await import("./env");
    const { getDb } = await import("@/db/client");
    getDb();
  } catch (e) {
    console.error(`\n${e instanceof Error ? e.message : String(e)}\n`);
    process.exit(1);
  }
}
