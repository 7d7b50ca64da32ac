import type { Metadata } from "next";
import Link from "next/link";
import { CareLogForm } from "@/components/owner/care-log-form";
import { Card, PageHeader } from "@/components/ui/card";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { getLogForm } from "@/lib/owner/care-log";

export const metadata: Metadata = { title: "Correct a care-log entry" };

export default async function EditCareLogPage({ params }: { params: Promise<{ id: string; entryId: string }> }) {
  const { id, entryId } = await params;
  const data = await forPage(async () => getLogForm(await requireUser(), id, { entryId }));
  const entry = data.entry!;
  return (
    <>
      <p className="text-sm font-medium text-muted">
        <Link href={`/pieces/${data.piece.id}#care-log`} className="inline-flex min-h-11 items-center hover:underline">
          ← {data.piece.title}
        </Link>
      </p>
      <PageHeader title="Correct a care-log entry" lead="Fix the date or the details, or delete the entry if it was logged by mistake." />
      <Card>
        <CareLogForm
          pieceId={data.piece.id}
          entryId={entry.id}
          tasks={data.tasks}
          today={data.today}
          defaults={{ taskKind: entry.taskKind, surface: entry.surface, doneOn: entry.doneOn, productUsed: entry.productUsed, notes: entry.notes }}
        />
      </Card>
    </>
  );
}
