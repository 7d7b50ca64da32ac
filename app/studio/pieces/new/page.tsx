import type { Metadata } from "next";
import { PieceForm } from "@/components/pieces/piece-form";
import { PageHeader } from "@/components/ui/card";
import { forPage } from "@/lib/auth/page";
import { pieceFormContext } from "@/lib/pieces/registry";

export const metadata: Metadata = { title: "New piece" };

export default async function NewPiecePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { client } = await searchParams;
  const f = await forPage(() => pieceFormContext(undefined, typeof client === "string" && client.length <= 64 ? client : undefined));
  return (
    <>
      <PageHeader title="New piece" lead="Record a delivered piece. Its registration code is issued when you save, ready for the drawer card." />
      <PieceForm mode="create" unitSystem={f.unitSystem} products={f.products} members={f.members} today={f.today} buyer={f.buyer} />
    </>
  );
}
