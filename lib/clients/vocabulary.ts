// Clients' enumerations and the words shown for them. Pure: the schema, the forms and the pages import it.

export const CONTACT_METHODS = ["email", "phone", "post"] as const;
export type ContactMethod = (typeof CONTACT_METHODS)[number];
/** Service mail: care reminders and visit mail. Offers: refresh offers. */
export const CONSENT_KINDS = ["service", "offers"] as const;
export type ConsentKind = (typeof CONSENT_KINDS)[number];
/** How a consent was given or withdrawn. */
export const CONSENT_SOURCES = ["in_person", "phone", "email", "paper", "account", "imported"] as const;
export type ConsentSource = (typeof CONSENT_SOURCES)[number];

/** The clients list's filters and sorts (its URL's `filter` and `sort`). */
export const CLIENT_FILTERS = ["account", "invited", "unregistered", "open_claims", "paused"] as const;
export const CLIENT_SORTS = ["name", "newest", "updated"] as const;

export const CONTACT_METHOD_LABELS: Record<ContactMethod, string> = { email: "E-mail", phone: "Phone", post: "Post" };
export const CONSENT_KIND_LABELS: Record<ConsentKind, string> = {
  service: "Service mail (care reminders, visit mail)",
  offers: "Offers (refresh offers)",
};
/** The same, in a word or two: in a sentence ("Agreed to service mail") and in the consent form's narrow select. */
export const CONSENT_KIND_NAMES: Record<ConsentKind, string> = { service: "Service mail", offers: "Offers" };
export const CONSENT_SOURCE_LABELS: Record<ConsentSource, string> = {
  in_person: "In person",
  phone: "On the phone",
  email: "By e-mail",
  paper: "On a signed form",
  account: "In their Grainward account",
  imported: "From imported records",
};

/** A bulk hand-over mailing: waiting for the runner, being sent, finished. */
export const HANDOVER_BATCH_STATES = ["queued", "running", "done"] as const;
export type HandoverBatchState = (typeof HANDOVER_BATCH_STATES)[number];
/** Where a bulk hand-over mailing came from: staff picking pieces, or a CSV import's "send now". */
export const HANDOVER_BATCH_SOURCES = ["staff", "import"] as const;
/** One piece of a mailing: still to do, being sent, and how it ended. */
export const HANDOVER_ITEM_OUTCOMES = ["pending", "sending", "sent", "skipped", "failed"] as const;
export type HandoverItemOutcome = (typeof HANDOVER_ITEM_OUTCOMES)[number];
