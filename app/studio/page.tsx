import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { studioCounts } from "@/lib/pieces/queries";

export const metadata: Metadata = { title: "Studio overview" };

export default async function StudioOverviewPage() {
  const ctx = await forPage(requireStaff);
  const counts = studioCounts(ctx);
  const figures = [
    { label: "Pieces delivered", value: counts.delivered, href: "/studio/pieces" },
    { label: "Registered by their owners", value: counts.registered, href: "/studio/pieces" },
    { label: "Finish layers on record", value: counts.layers, href: "/studio/pieces" },
  ];
  return (
    <>
      <PageHeader title={ctx.studio.name} lead="Your studio's aftercare at a glance." />
      <div className="grid gap-4 sm:grid-cols-3">
        {figures.map((f) => (
          <Link key={f.label} href={f.href} className="block rounded-xl focus-visible:outline-offset-4">
            <Card className="h-full hover:border-resin">
              <p className="text-sm text-muted">{f.label}</p>
              <p className="mt-1 font-display text-4xl font-semibold">{f.value}</p>
            </Card>
          </Link>
        ))}
      </div>
    </>
  );
}
