import type { ReactNode } from "react";
import { StudioBrand } from "@/components/shell/studio-brand";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { isAppError } from "@/lib/errors";
import { ownedPieceRow } from "@/lib/owner/pieces";
import { studioBrand } from "@/lib/studio/brand-query";

/** The owner's pages of one piece (the piece, its care log, claims, transfer) carry the brand of the studio that made it. */
export default async function OwnerPieceLayout({ children, params }: { children: ReactNode; params: Promise<{ id: string }> }) {
  const [user, { id }] = await Promise.all([forPage(requireUser), params]);
  let brand = null;
  try {
    brand = studioBrand(ownedPieceRow(user, id).studioId);
  } catch (e) {
    // Not this person's piece: the page answers it (not found) and shows no studio.
    if (!isAppError(e)) throw e;
  }
  return (
    <>
      {brand ? <StudioBrand brand={brand} /> : null}
      {children}
    </>
  );
}
