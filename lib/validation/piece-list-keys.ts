// The registry list's sort keys and page sizes, without zod, so the registry table can read its URL with them
// without loading the schemas (pieceListQuerySchema in ./pieces.ts is built from the same lists).

export const PAGE_SIZES = [10, 25, 50, 100] as const;
export const SORTS = ["relevance", "delivered", "title", "next_due", "created"] as const;
