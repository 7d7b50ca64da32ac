import type { ReactNode } from "react";
import { StudioBrand } from "@/components/shell/studio-brand";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { ownedPieceShell } from "@/lib/owner/pieces";

/** The owner's pages of one piece (the piece, its care log, claims, transfer) carry the brand of the studio that made it. */
export default async function OwnerPieceLayout({ children, params }: { children: ReactNode; params: Promise<{ id: string }> }) {
  const [user, { id }] = await Promise.all([forPage(requireUser), params]);
  // Not this person's piece: no studio shown; the page answers it (not found).
  const brand = ownedPieceShell(user, id)?.brand;
  return (
    <>
      {brand ? <StudioBrand brand={brand} /> : null}
      {children}
    </>
  );
}
