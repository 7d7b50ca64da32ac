// What the drawer card, the owner's transfer page and the studio's piece page say about the card's
// code when a piece changes hands: one sentence, so they cannot disagree. Pure (no server-only), so
// client components may show it too.

/** Printed on every drawer card and shown on the transfer page. */
export const CODE_WHEN_PIECE_CHANGES_HANDS =
  "When the piece changes hands, its owner releases it in Grainward and gets a new code for the next owner; the code on the drawer card then stops working.";

/** Grainward's own name on a studio's printed card or certificate: small, after the studio's brand. */
export const CARE_RECORDS_BY = "care records by Grainward";
