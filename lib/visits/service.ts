// Temporary re-exports for callers another change has open (app/studio/setup/[step]/page.tsx,
// tests/integration/reminders-stop.test.ts); the operations live one per file beside this one.
export { bookVisit } from "./book";
export { listJobSlots } from "./slots";
export { listTechnicians } from "./technicians";
