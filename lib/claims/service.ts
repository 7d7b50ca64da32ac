// Temporary re-exports for callers another change has open (app/studio/claims/[id]/page.tsx,
// tests/integration/visits-thread.test.ts, lib/visits/service.ts); the operations live one per
// file beside this one.
export { fileUrl } from "./claim-row";
export { followJob } from "./follow-job";
export { createJobFromClaim } from "./open-job";
export { getStaffClaim } from "./view-claim";
