// The studio's registry of pieces, one file per operation (each reads top to bottom), re-exported here
// so callers import from one place:
//   registry-list.ts    search, filters, sorting, pagination (GET /api/pieces) and the CSV export's query
//   registry-create.ts  a new piece (POST /api/pieces, imports)
//   registry-update.ts  editing, archiving (PATCH /api/pieces/[id])
//   registry-delete.ts  deleting, or archiving a registered piece (DELETE /api/pieces/[id])
//   registry-code.ts    the registration code: reissue, reveal, match what was typed
//   registry-detail.ts  the staff piece page: record, stack, schedule, timeline, stack history
//   registry-form.ts    the new/edit form's page loader
//   registry-common.ts  what they share: publicPiece, the studio-scoped piece read, catalog, members
//   registry-sql.ts     the performance-tuned SQL of all of them
export { loadPiece, publicPiece, studioMembers, studioProducts, type PublicPiece } from "./registry-common";
export { listPieces, queryRegistry, type RegistryPage, type RegistryRow } from "./registry-list";
export { LIST_COUNT_CAP, loadFullPieces, SEARCH_COUNT_CAP } from "./registry-sql";
export { checkLayerRefs, createPiece, insertPiece } from "./registry-create";
export { updatePiece } from "./registry-update";
export { deletePiece } from "./registry-delete";
export { findByTypedCode, reissueRegistrationCode, revealRegistrationCode } from "./registry-code";
export { getPieceDetail, layerHistory, piecePage, type TimelineEvent } from "./registry-detail";
export { pieceFormContext } from "./registry-form";
