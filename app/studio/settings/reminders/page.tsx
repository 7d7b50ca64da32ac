import type { Metadata } from "next";
import { ReminderTimingForm } from "@/components/settings/reminder-timing-form";
import { Card } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { reminderTiming } from "@/lib/settings";
import { saveReminderTimingAction } from "../actions";

export const metadata: Metadata = { title: "Reminder timing" };

export default async function ReminderTimingPage() {
  const ctx = await forPage(requireAdmin);
  const t = reminderTiming(ctx);
  return (
    <Card className="space-y-4">
      <div>
        <h2 className="font-display text-xl font-semibold">Reminder timing</h2>
        <p className="text-sm text-muted">
          Care reminders go out by e-mail at this hour in each owner&apos;s own time zone, never twice for the same task and step. Owners can turn reminders off in their preferences.
        </p>
      </div>
      <ReminderTimingForm values={t} action={saveReminderTimingAction} />
    </Card>
  );
}
