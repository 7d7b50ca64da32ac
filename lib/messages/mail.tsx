import "server-only";
import { ThreadMessageEmail, threadMessageSubject } from "@/emails/thread-message";
import type { Studio } from "@/db/schema";
import { studioRecipients } from "@/lib/claims/mail";
import { env } from "@/lib/env";
import { sendMail } from "@/lib/mail";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import { replyAddress } from "./reply-address";

// Mail about repair-job and visit threads (claim threads mail through lib/claims/mail.tsx). It goes
// out after the message is committed; sendMail queues what SMTP refuses, and anything else is logged,
// so a failed send never undoes the message.

const ABOUT = { job: "repair job", visit: "visit" } as const;

export type ThreadMailFacts = { threadId: string; kind: "job" | "visit"; jobId: string; studio: Pick<Studio, "id" | "name" | "email">; pieceTitle: string; owner: { name: string; email: string } };

/** A staff message to the owner, with the thread's own Reply-To so that an answer by e-mail lands in the thread. */
export async function mailOwner(f: ThreadMailFacts, authorName: string, body: string): Promise<void> {
  const props = { audience: "owner", authorName, studioName: f.studio.name, pieceTitle: f.pieceTitle, about: ABOUT[f.kind], body } as const;
  await mailAfterCommit("thread message to the owner", () =>
    sendMail({
      studioId: f.studio.id,
      to: f.owner.email,
      replyTo: replyAddress(f.threadId),
      subject: threadMessageSubject(props),
      email: <ThreadMessageEmail {...props} url={new URL(`/jobs/${f.jobId}`, env.APP_URL).toString()} />,
    }),
  );
}

/** An owner's message to the studio's address (or its admins), pointing at the thread in the inbox. */
export async function mailStudio(f: ThreadMailFacts, body: string): Promise<void> {
  const to = studioRecipients(f.studio);
  if (to.length === 0) return;
  const props = { audience: "studio", authorName: f.owner.name, studioName: f.studio.name, pieceTitle: f.pieceTitle, about: ABOUT[f.kind], body } as const;
  await mailAfterCommit("thread message to the studio", () =>
    sendMail({
      studioId: f.studio.id,
      to,
      replyTo: f.owner.email,
      subject: threadMessageSubject(props),
      email: <ThreadMessageEmail {...props} url={new URL(`/studio/inbox/${f.threadId}`, env.APP_URL).toString()} />,
    }),
  );
}
