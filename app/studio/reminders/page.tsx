import type { Metadata } from "next";
import { formatZone } from "@/lib/format";
import { RemindersBoard } from "@/components/reminders/reminders-board";
import { PageHeader } from "@/components/ui/card";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";

export const metadata: Metadata = { title: "Reminders" };
export const dynamic = "force-dynamic";

export default async function RemindersPage() {
  const ctx = await forPage(requireStaff);
  return (
    <>
      <PageHeader
        title="Care reminders"
        lead={`What goes out to owners in the coming days, and what went out. Reminders leave at ${String(ctx.studio.reminderSendHour).padStart(2, "0")}:00 in each owner's time zone; dates are in the studio's (${formatZone(ctx.studio.timeZone)}). Steps turned off in settings → reminder timing are not listed.`}
      />
      <RemindersBoard timeZone={ctx.studio.timeZone} />
    </>
  );
}
