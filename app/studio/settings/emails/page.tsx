import type { Metadata } from "next";
import Link from "next/link";
import { Card } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { listEmailTemplates } from "@/lib/settings/email-previews";

export const metadata: Metadata = { title: "E-mail previews" };

const AUDIENCE = { owner: "To owners", staff: "To the team", anyone: "To owners and the team" } as Record<string, string>;

export default async function EmailPreviewsPage() {
  const ctx = await forPage(requireAdmin);
  const templates = listEmailTemplates(ctx);
  return (
    <Card className="space-y-4">
      <div>
        <h2 className="font-display text-xl font-semibold">E-mail previews</h2>
        <p className="text-sm text-muted">Every message Grainward sends, shown with invented example values (no real owner&apos;s data).</p>
      </div>
      <ul className="divide-y divide-line">
        {templates.map((t) => (
          <li key={t.slug} className="py-3">
            <Link href={`/studio/settings/emails/${t.slug}`} className="font-medium text-resin underline underline-offset-2">
              {t.name}
            </Link>
            <p className="text-sm text-muted">
              {AUDIENCE[t.audience]} · {t.when}
            </p>
          </li>
        ))}
      </ul>
    </Card>
  );
}
