import type { Metadata } from "next";
import Link from "next/link";
import { ClientForm } from "@/components/clients/client-form";
import { Card, PageHeader } from "@/components/ui/card";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { zoneChoices } from "@/lib/format";

export const metadata: Metadata = { title: "New client" };
export const dynamic = "force-dynamic";

export default async function NewClientPage() {
  const ctx = await forPage(requireStaff);
  return (
    <>
      <p className="text-sm">
        <Link href="/studio/clients" className="inline-flex min-h-11 items-center text-resin underline">
          All clients
        </Link>
      </p>
      <PageHeader title="New client" lead="Someone you sold to or serve. They don't need a Grainward account; if they sign up later with this e-mail, the two are linked." />
      <Card>
        <ClientForm studioZone={ctx.studio.timeZone} zones={zoneChoices([ctx.studio.timeZone])} />
      </Card>
    </>
  );
}
