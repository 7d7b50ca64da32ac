import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { PIECE_KIND_LABELS } from "@/lib/care/vocabulary";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { listStudioPieces } from "@/lib/pieces/queries";

export const metadata: Metadata = { title: "Pieces" };

export default async function StudioPiecesPage() {
  const ctx = await forPage(requireStaff);
  const rows = listStudioPieces(ctx, { limit: 200 });
  return (
    <>
      <PageHeader title="Pieces" lead="Every piece the studio has delivered, newest first." />
      {rows.length === 0 ? (
        <Card>No pieces recorded yet.</Card>
      ) : (
        <ul className="divide-y divide-line overflow-hidden rounded-xl border border-line bg-card">
          {rows.map((p) => (
            <li key={p.id}>
              <Link href={`/studio/pieces/${p.id}`} className="flex flex-col gap-0.5 px-4 py-3 hover:bg-resin-soft sm:flex-row sm:items-center sm:justify-between">
                <span className="font-medium">{p.title}</span>
                <span className="text-sm text-muted">
                  {PIECE_KIND_LABELS[p.kind]} · delivered {p.deliveredOn} · {p.ownerName ?? "not registered yet"}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
