import type { Metadata } from "next";
import { Card, PageHeader } from "@/components/ui/card";
import { requireStudioMember } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";

export const metadata: Metadata = { title: "My day" };

export default async function TechnicianDayPage() {
  const ctx = await forPage(requireStudioMember);
  const today = new Intl.DateTimeFormat("en-GB", { dateStyle: "full", timeZone: ctx.studio.timeZone }).format(new Date());
  return (
    <>
      <PageHeader title="My day" lead={today} />
      <Card>
        <p className="font-semibold">No visits booked for you today.</p>
        <p className="text-muted">Booked touch-up visits will be listed here in order, with the address and what to bring.</p>
      </Card>
    </>
  );
}
