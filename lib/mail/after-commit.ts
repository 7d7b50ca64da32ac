// The one way to send mail about a change that is already committed (a claim decided, a visit
// booked, a message posted): the change stands whatever happens to the mail. sendMail itself keeps
// what SMTP refuses in mail_queue for another try (lib/mail/index.ts); anything else it throws (a
// template that fails to render, a row that has gone) is logged here and never reaches the caller.

/** Runs `send` and logs its failure under `what` ("claim decision", "visit booked"); never throws. */
export async function mailAfterCommit(what: string, send: () => Promise<unknown>): Promise<void> {
  try {
    await send();
  } catch (e) {
    console.error(`mail (${what}) failed`, e);
  }
}
