import type { Metadata } from "next";
import Link from "next/link";
import { Card } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { renderEmailPreview } from "@/lib/settings/email-previews";

export const metadata: Metadata = { title: "E-mail preview" };

export default async function EmailPreviewPage({ params }: { params: Promise<{ template: string }> }) {
  const { template } = await params;
  const preview = await forPage(async () => renderEmailPreview(await requireAdmin(), template));
  return (
    <div className="space-y-4">
      <p className="text-sm">
        <Link href="/studio/settings/emails" className="text-resin underline underline-offset-2">
          ← All e-mails
        </Link>
      </p>
      <Card className="space-y-3">
        <div>
          <h2 className="font-display text-xl font-semibold">{preview.name}</h2>
          <p className="text-sm text-muted">{preview.when} Example values are invented.</p>
        </div>
        {/* The message's own HTML, isolated in a sandboxed frame with no scripts. */}
        <iframe title={`${preview.name}, HTML version`} srcDoc={preview.html} sandbox="" className="h-[36rem] w-full rounded-lg border border-line bg-white" />
        <details className="rounded-lg border border-line bg-paper/60 px-3 py-2 text-sm">
          <summary className="flex min-h-11 cursor-pointer items-center font-medium text-resin">Plain-text version</summary>
          <pre className="overflow-x-auto whitespace-pre-wrap pb-2 font-sans">{preview.text}</pre>
        </details>
      </Card>
    </div>
  );
}
