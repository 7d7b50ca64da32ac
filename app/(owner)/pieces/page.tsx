import type { Metadata } from "next";
import Link from "next/link";
import { TaskStatus } from "@/components/owner/task-status";
import { ButtonLink } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { formatDate, relativeDays } from "@/lib/format";
import { listMyPieces } from "@/lib/owner/pieces";

export const metadata: Metadata = { title: "My pieces" };

export default async function OwnerPiecesPage() {
  const pieces = await forPage(async () => listMyPieces(await requireUser()));
  return (
    <>
      <PageHeader
        title="My pieces"
        lead="Everything you've registered, from every studio, with the next care each one needs."
        actions={
          <ButtonLink href="/register" variant="secondary">
            <SpriteIcon name="plus" className="size-4" />
            Register a piece
          </ButtonLink>
        }
      />
      {pieces.length === 0 ? (
        <Card className="space-y-2">
          <p className="font-semibold">No pieces yet</p>
          <p className="text-muted">Look for the card in your piece&apos;s drawer: scan its QR code, or type its code on the registration page.</p>
        </Card>
      ) : (
        <ul className="space-y-3">
          {pieces.map((p) => (
            <li key={p.id}>
              <Link href={`/pieces/${p.id}`} className="group block rounded-xl border border-line bg-card p-4 shadow-[0_1px_0_#e4dccf] hover:border-resin">
                <div className="flex items-start gap-3">
                  <div className="min-w-0 flex-1">
                    <p className="font-display text-lg font-semibold leading-snug group-hover:text-resin">{p.title}</p>
                    <p className="text-sm text-muted">
                      {p.kindLabel} · {p.studioName} · delivered {formatDate(p.deliveredOn, { short: true })}
                    </p>
                  </div>
                  <SpriteIcon name="chevron-right" className="mt-1 size-5 shrink-0 text-muted" />
                </div>
                {p.nextTask ? (
                  <div className="mt-3 flex flex-wrap items-center gap-x-2 gap-y-1 border-t border-line pt-3 text-sm">
                    <span className="text-muted">Next:</span>
                    <span className="font-semibold">{p.nextTask.label}</span>
                    <span className="text-muted">
                      {formatDate(p.nextTask.dueOn, { short: true })} ({relativeDays(p.nextTask.daysUntilDue)})
                    </span>
                    <TaskStatus status={p.nextTask.status} daysUntilDue={p.nextTask.daysUntilDue} />
                  </div>
                ) : null}
              </Link>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
