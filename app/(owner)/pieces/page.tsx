import type { Metadata } from "next";
import { Card, PageHeader } from "@/components/ui/card";
import { PIECE_KIND_LABELS } from "@/lib/care/vocabulary";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { listOwnerPieces } from "@/lib/pieces/queries";

export const metadata: Metadata = { title: "My pieces" };

export default async function OwnerPiecesPage() {
  const user = await forPage(requireUser);
  const pieces = listOwnerPieces(user);
  return (
    <>
      <PageHeader title="My pieces" lead="Everything you've registered, from every studio." />
      {pieces.length === 0 ? (
        <Card className="space-y-2">
          <p className="font-semibold">No pieces yet</p>
          <p className="text-muted">Look for the card in your piece&apos;s drawer: scan its QR code, or type its code on the registration page.</p>
        </Card>
      ) : (
        <ul className="space-y-3">
          {pieces.map((p) => (
            <li key={p.id}>
              <Card className="flex flex-col gap-1">
                <p className="font-display text-lg font-semibold">{p.title}</p>
                <p className="text-sm text-muted">
                  {PIECE_KIND_LABELS[p.kind]} · {p.studioName} · delivered {p.deliveredOn}
                </p>
              </Card>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
