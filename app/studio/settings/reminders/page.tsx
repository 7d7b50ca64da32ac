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
      <div className="space-y-2">
        <h2 className="font-display text-xl font-semibold">Reminder timing</h2>
        <p className="text-sm text-muted">
          For every care task of a registered piece, Grainward can e-mail the owner up to three times: 14 days before the task is due, on the due date, and 30 days after it if no
          care has been logged. Tick the ones you want sent; a step left unticked is simply not sent, and a refresh offer then goes with the first ticked one.
        </p>
        <p className="text-sm text-muted">
          The hour is the owner&apos;s local time, not the studio&apos;s: with 09:00, an owner in another time zone gets the reminder shortly after 09:00 where they live (the
          reminder run goes every hour). If their clocks skip that hour on the night summer time starts, it goes out just after the jump, the same day. No reminder is
          sent twice for the same task and step.
        </p>
        <p className="text-sm text-muted">
          A change counts from the next hourly run. It does not affect visit reminders or mail about claims, and owners can still turn care reminders off in their preferences.
        </p>
      </div>
      <ReminderTimingForm values={t} action={saveReminderTimingAction} />
    </Card>
  );
}
