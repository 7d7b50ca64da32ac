// Conversations: what owners post about a claim, repair job or visit, and what staff do in the inbox.
import { z } from "zod";

/** The longest message kept, typed or e-mailed (a longer e-mailed reply is cut, with a note). */
export const MAX_MESSAGE_CHARS = 4000;

export const messageBody = z.string().trim().min(1, "Write a message first.").max(MAX_MESSAGE_CHARS, "Use at most 4,000 characters.");

export const messageFormSchema = z.object({ body: messageBody });
export type MessageFormInput = z.input<typeof messageFormSchema>;
export type MessageForm = z.output<typeof messageFormSchema>;

/** What an owner's message is about (the query of POST /api/threads); the body is read after the owner is found to be allowed. */
export const messageSubjectSchema = z.object({
  about: z.enum(["claim", "job", "visit"], "Say what the message is about."),
  id: z.string().min(1, "Say which one the message is about.").max(64),
});
export type MessageSubject = z.output<typeof messageSubjectSchema>;

export const threadIdParam = z.object({ id: z.string().min(1).max(64) });

export const INBOX_VIEWS = ["waiting", "mine", "all", "done", "unmatched"] as const;
export const inboxQuerySchema = z.object({ view: z.enum(INBOX_VIEWS).catch("waiting") });
export type InboxQuery = z.output<typeof inboxQuerySchema>;

export const threadUpdateSchema = z
  .object({
    /** A staff member of the studio, or null to leave it with nobody. */
    assignedToId: z.string().min(1).max(64).nullable().optional(),
    state: z.enum(["open", "done"]).optional(),
  })
  .refine((v) => v.assignedToId !== undefined || v.state !== undefined, "Say what to change: the assignee or the state.");
export type ThreadUpdate = z.output<typeof threadUpdateSchema>;
