import type { Metadata } from "next";
import { Card, PageHeader } from "@/components/ui/card";
import { FINISH_CLASS_LABELS, PIECE_KIND_LABELS } from "@/lib/care/vocabulary";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { getStudioPiece } from "@/lib/pieces/queries";

export const metadata: Metadata = { title: "Piece" };

export default async function StudioPiecePage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const piece = await forPage(async () => getStudioPiece(await requireStaff(), id));
  return (
    <>
      <PageHeader title={piece.title} lead={`${PIECE_KIND_LABELS[piece.kind]} · delivered ${piece.deliveredOn}`} />
      <div className="grid gap-4 md:grid-cols-2">
        <Card className="space-y-2">
          <h2 className="font-semibold">Owner</h2>
          <p>{piece.owner ? `${piece.owner.name} (${piece.owner.email})` : "Not registered yet"}</p>
        </Card>
        <Card className="space-y-2">
          <h2 className="font-semibold">Finish stack</h2>
          <ol className="space-y-1 text-sm">
            {piece.layers.map((l) => (
              <li key={l.id}>
                {l.surface}: {FINISH_CLASS_LABELS[l.finishClass]}
                {l.productLabel ? ` — ${l.productLabel}` : ""}, {l.coats} coat{l.coats === 1 ? "" : "s"}, {l.appliedOn}
              </li>
            ))}
          </ol>
        </Card>
      </div>
    </>
  );
}
