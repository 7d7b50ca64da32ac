import type { Metadata } from "next";
import Link from "next/link";
import { formatZone } from "@/lib/format";
import { Card, PageHeader } from "@/components/ui/card";
import { HoursEditor } from "@/components/visits/hours-editor";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { listTechnicians } from "@/lib/visits/technicians";

export const metadata: Metadata = { title: "Working hours" };
export const dynamic = "force-dynamic";

export default async function TechnicianHoursPage() {
  const ctx = await forPage(requireStaff);
  const techs = listTechnicians(ctx);
  return (
    <>
      <PageHeader title="Working hours" lead={`Weekly hours and days off of each technician, in ${formatZone(ctx.studio.timeZone)}. Free visit times come from these.`} />
      <div className="space-y-6">
        {techs.length === 0 ? (
          <Card>
            No technicians in this studio yet.{" "}
            {ctx.role === "admin" ? (
              <Link className="font-medium text-resin underline" href="/studio/team">
                Invite one on the Team page.
              </Link>
            ) : (
              "An admin can invite one on the Team page."
            )}
          </Card>
        ) : null}
        {techs.map((t) => (
          <Card key={t.id} className="space-y-3">
            <h2 className="font-semibold">{t.name}</h2>
            <HoursEditor technicianId={t.id} name={t.name} initial={{ hours: t.hours, timeOff: t.timeOff }} editable />
          </Card>
        ))}
      </div>
    </>
  );
}
