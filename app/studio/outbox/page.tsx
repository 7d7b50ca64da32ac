import type { Metadata } from "next";
import { OutboxList } from "@/components/outbox/outbox-list";
import { Card, PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { listOutbox } from "@/lib/mail/outbox";

export const metadata: Metadata = { title: "Outbox" };
export const dynamic = "force-dynamic";

export default async function OutboxPage() {
  const { messages, reachable, studioName, timeZone } = await forPage(async () => {
    const ctx = await requireAdmin();
    return { ...(await listOutbox(ctx)), studioName: ctx.studio.name, timeZone: ctx.studio.timeZone };
  });
  return (
    <>
      <PageHeader
        title="Outbox"
        lead={`The e-mail sent for ${studioName}, as the local mail sink received it. Development and demo only. Account e-mail (address confirmations, password resets) is never shown here.`}
      />
      {!reachable ? (
        <Notice tone="warn" title="The mail sink isn't answering">Start it with <code>npm run sink</code> (the demo starts it for you).</Notice>
      ) : messages.length === 0 ? (
        <Card>No e-mail sent for this studio yet.</Card>
      ) : (
        <OutboxList messages={messages} timeZone={timeZone} />
      )}
    </>
  );
}
