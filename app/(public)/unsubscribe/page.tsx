import type { Metadata } from "next";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { isAppError } from "@/lib/errors";
import { reminderPreferencesByToken } from "@/lib/reminders/unsubscribe";
import { setRemindersAction } from "./actions";

export const metadata: Metadata = { title: "Care reminder e-mails", robots: { index: false } };
export const dynamic = "force-dynamic";

function load(t: string | undefined) {
  try {
    return { prefs: reminderPreferencesByToken(t) };
  } catch (e) {
    if (isAppError(e)) return { error: e.message };
    throw e;
  }
}

export default async function UnsubscribePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const sp = await searchParams;
  const t = typeof sp.t === "string" ? sp.t : undefined;
  const done = sp.done === "on" || sp.done === "off" ? sp.done : undefined;
  const { prefs, error } = load(t);
  return (
    <div className="mx-auto max-w-xl px-4 py-10 sm:py-16">
      <h1 className="mb-4 font-display text-3xl font-semibold tracking-tight">Care reminder e-mails</h1>
      {!prefs ? (
        <Notice tone="error" title="This link doesn't work">{error ?? "Use the link in your latest care e-mail."}</Notice>
      ) : (
        <Card className="space-y-4">
          {done === "off" ? <Notice tone="ok" title="Unsubscribed">No more care reminders or refresh offers will be sent to {prefs.email}.</Notice> : null}
          {done === "on" ? <Notice tone="ok" title="Reminders are back on">Care reminders will be sent to {prefs.email} again.</Notice> : null}
          <p className="flex items-center gap-2">
            {prefs.remindersEnabled ? <SpriteIcon name="bell-ring" className="size-5 text-resin" /> : <SpriteIcon name="bell-off" className="size-5 text-muted" />}
            <span>
              Care reminders for <strong>{prefs.email}</strong> are <strong>{prefs.remindersEnabled ? "on" : "off"}</strong>.
            </span>
          </p>
          <p className="text-sm text-muted">
            Care reminders tell you when the finish of a piece needs care, and may include an offer of a refresh visit. Mail about your own
            claims, payments and visits is not affected and still comes.
          </p>
          <form action={setRemindersAction}>
            <input type="hidden" name="t" value={t} />
            <input type="hidden" name="enable" value={prefs.remindersEnabled ? "false" : "true"} />
            <Button type="submit" variant={prefs.remindersEnabled ? "danger" : "primary"}>
              {prefs.remindersEnabled ? "Unsubscribe from care reminders" : "Turn care reminders back on"}
            </Button>
          </form>
        </Card>
      )}
    </div>
  );
}
