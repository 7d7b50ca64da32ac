import type { Metadata } from "next";
import { VisitRulesForm } from "@/components/settings/visit-rules-form";
import { Card } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { visitRules } from "@/lib/settings";
import { saveVisitRulesAction } from "../actions";

export const metadata: Metadata = { title: "Visit booking" };

export default async function VisitRulesPage() {
  const ctx = await forPage(requireAdmin);
  return (
    <Card className="space-y-4">
      <div className="space-y-2">
        <h2 className="font-display text-xl font-semibold">Visit booking</h2>
        <p className="text-sm text-muted">
          When a repair job is paid or covered, the owner picks a visit from the free slots of your technicians: inside each technician&apos;s working hours, clear of their time
          off and other visits, and as long as the job&apos;s tasks take. These rules shape which slots are offered.
        </p>
        <p className="text-sm text-muted">A change applies to slots offered from now on. Visits already booked keep their time.</p>
      </div>
      <VisitRulesForm values={visitRules(ctx)} action={saveVisitRulesAction} />
    </Card>
  );
}
