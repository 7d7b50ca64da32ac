// Temporary re-exports for tests/integration/inbox.test.ts, which another change has open; the
// operations live one per file beside this one. Remove once that test imports them directly.
export { decideClaim } from "./decide-claim";
export { getOwnerClaim } from "./view-claim";
export { transitionClaim } from "./transition";
