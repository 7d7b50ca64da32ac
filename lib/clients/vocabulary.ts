// Clients' enumerations and the words shown for them. Pure: the schema, the forms and the pages import it.

export const CONTACT_METHODS = ["email", "phone", "post"] as const;
export type ContactMethod = (typeof CONTACT_METHODS)[number];
/** Service mail: care reminders and visit mail. Offers: refresh offers. */
export const CONSENT_KINDS = ["service", "offers"] as const;
export type ConsentKind = (typeof CONSENT_KINDS)[number];
/** How a consent was given or withdrawn. */
export const CONSENT_SOURCES = ["in_person", "phone", "email", "paper", "account", "imported"] as const;
export type ConsentSource = (typeof CONSENT_SOURCES)[number];

export const CONTACT_METHOD_LABELS: Record<ContactMethod, string> = { email: "E-mail", phone: "Phone", post: "Post" };
export const CONSENT_KIND_LABELS: Record<ConsentKind, string> = {
  service: "Service mail (care reminders, visit mail)",
  offers: "Offers (refresh offers)",
};
export const CONSENT_SOURCE_LABELS: Record<ConsentSource, string> = {
  in_person: "In person",
  phone: "On the phone",
  email: "By e-mail",
  paper: "On a signed form",
  account: "In their Grainward account",
  imported: "From imported records",
};
