// Runs once when the server starts: a bad configuration or an unmigrated database stops it here,
// with a message saying what to do, instead of failing on the first request. The check lives in a
// Node-only module, so the Edge build of this file never meets process.exit.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  await (await import("./lib/startup-check")).checkStartup();
  // Per-address rate limits need the socket's address, which route handlers never see.
  const [{ stampClientAddresses }, { env }] = await Promise.all([import("./lib/auth/client-address"), import("./lib/env")]);
  stampClientAddresses(env.TRUST_PROXY);
  // Not awaited: the server answers at once while the PDF renderer starts for the first drawer card.
  void import("./lib/pieces/card-warm").then((m) => m.warmCardRenderer());
}
