import type { Metadata } from "next";
import { PieceForm } from "@/components/pieces/piece-form";
import { PageHeader } from "@/components/ui/card";
import { forPage } from "@/lib/auth/page";
import { pieceFormContext } from "@/lib/pieces/registry";

export const metadata: Metadata = { title: "Edit piece" };

export default async function EditPiecePage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const f = await forPage(() => pieceFormContext(id));
  return (
    <>
      <PageHeader title={`Edit ${f.piece!.title}`} lead="Lengths are stored in millimetres; switch units on the form as you like." />
      <PieceForm mode="edit" pieceId={id} initial={f.initial} unitSystem={f.unitSystem} products={f.products} members={f.members} today={f.today} />
    </>
  );
}
