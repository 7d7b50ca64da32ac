// Moved to lib/format (the one formatter); kept only until lib/claims/service.ts imports from there.
export { formatClock, formatVisitWhen, ownerTimeZone, visitDayWord } from "@/lib/format";
