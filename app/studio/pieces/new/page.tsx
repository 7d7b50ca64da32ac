import type { Metadata } from "next";
import { PieceForm } from "@/components/pieces/piece-form";
import { PageHeader } from "@/components/ui/card";
import { forPage } from "@/lib/auth/page";
import { pieceFormContext } from "@/lib/pieces/registry";

export const metadata: Metadata = { title: "New piece" };

export default async function NewPiecePage() {
  const f = await forPage(() => pieceFormContext());
  return (
    <>
      <PageHeader title="New piece" lead="Record a delivered piece. Its registration code is issued when you save, ready for the drawer card." />
      <PieceForm mode="create" unitSystem={f.unitSystem} products={f.products} members={f.members} today={f.today} />
    </>
  );
}
