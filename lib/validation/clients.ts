// Clients (the studio's record of its people): shared by the client edit form (loaded lazily), the
// route handlers and lib/clients. The phone is checked here for its characters only; lib/clients
// reads it with the studio's country and answers a number that can't be read with a field error.
import { z } from "zod";
import { CLIENT_FILTERS, CLIENT_SORTS, CONSENT_SOURCES, CONTACT_METHODS } from "@/lib/clients/vocabulary";
import { pastDate } from "./dates";
import { createPieceSchema } from "./pieces";
import { patchOf } from "./patch";
import { isTimeZone } from "@/lib/format";

const optionalText = (max: number, tooLong: string) => z.string().trim().max(max, tooLong);

/** A change of one consent: given or withdrawn, on which day, and how. */
export const consentChangeSchema = z.object({
  granted: z.boolean({ message: "Choose whether they agreed." }),
  givenOn: pastDate("Pick the day they told you.").optional(),
  source: z.enum(CONSENT_SOURCES, { message: "Pick how they told you." }),
  note: optionalText(500, "Keep the note under 500 characters.").default(""),
});
export type ConsentChange = z.output<typeof consentChangeSchema>;

export const clientFields = z.object({
  name: z.string({ message: "Enter their name." }).trim().min(1, "Enter their name.").max(200, "Keep the name under 200 characters."),
  email: z
    .string()
    .trim()
    .toLowerCase()
    .max(254, "That e-mail address is too long.")
    .refine((s) => s === "" || z.email().safeParse(s).success, "That doesn't look like an e-mail address.")
    .default(""),
  phone: z
    .string()
    .trim()
    .max(40, "That phone number is too long.")
    .refine((s) => s === "" || /^[+\d\s().\-/]*(?:(?:ext\.?|x|#)\s*\d+)?$/i.test(s), "Use digits, spaces, + ( ) - only.")
    .default(""),
  address: optionalText(500, "Keep the address under 500 characters.").default(""),
  preferredContact: z.enum(CONTACT_METHODS, { message: "Pick e-mail, phone or post." }).default("email"),
  /** Empty: the studio's time zone. */
  timeZone: z
    .string()
    .trim()
    .max(64)
    .refine((s) => s === "" || isTimeZone(s), "That isn't a time zone we know — pick one from the list.")
    .default(""),
  notes: optionalText(5000, "Keep the notes under 5,000 characters.").default(""),
});

const consentFields = z.object({ service: consentChangeSchema.optional(), offers: consentChangeSchema.optional() });

export const createClientSchema = clientFields.extend({ consent: consentFields.optional() });
export type CreateClientInput = z.input<typeof createClientSchema>;
export type CreateClientValues = z.output<typeof createClientSchema>;

export const clientPatchSchema = patchOf(clientFields)
  .extend({ consent: consentFields.optional() })
  .refine((v) => Object.keys(v).length > 0, "Nothing to change.");
export type ClientPatch = z.output<typeof clientPatchSchema>;

/** The edit form's values (contact details only; consent has its own small form). */
export const clientFormSchema = clientFields;
export type ClientFormInput = z.input<typeof clientFormSchema>;

export { CLIENT_FILTERS, CLIENT_SORTS };
export const CLIENT_PAGE_SIZE = 50;

/** The clients list's state, also its URL's query string. Empty strings count as absent. */
export const clientListQuerySchema = z.preprocess(
  (raw) => (raw && typeof raw === "object" ? Object.fromEntries(Object.entries(raw).filter(([, v]) => v !== "" && v != null)) : raw),
  z.object({
    q: z.string().trim().max(200, "Search for at most 200 characters.").default(""),
    filter: z.enum(CLIENT_FILTERS, { message: "Pick one of the filters." }).optional(),
    sort: z.enum(CLIENT_SORTS, { message: "Sort by name, newest or last changed." }).default("name"),
    dir: z.enum(["asc", "desc"]).optional(),
    page: z.coerce.number().int().min(1).max(100_000).default(1),
  }),
);
export type ClientListQuery = z.output<typeof clientListQuerySchema>;

export const TIMELINE_PAGE = 50;
export const TIMELINE_MAX = 1000;
export const timelineQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(TIMELINE_MAX, `At most ${TIMELINE_MAX} entries at once.`).default(TIMELINE_PAGE),
});

export const clientIdParam = z.object({ id: z.string().min(1).max(64) });

// ---- the buyer of a piece at delivery, and the hand-over mail ----

export const BUYER_MODES = ["none", "existing", "new"] as const;

/**
 * The buyer fields of the new-piece form: nobody yet, a client of the studio, or a new client typed
 * in the same form (their service-mail consent recorded as given in person). The hand-over mail goes
 * out when asked and when the buyer has an e-mail and agreed to service mail.
 */
export const buyerFields = z
  .object({
    buyer: z.enum(BUYER_MODES, { message: "Pick who bought the piece." }).default("none"),
    buyerClientId: z.string().trim().max(64).default(""),
    buyerName: z.string().trim().max(200, "Keep the name under 200 characters.").default(""),
    buyerEmail: clientFields.shape.email,
    buyerPhone: clientFields.shape.phone,
    buyerServiceMail: z.boolean().default(false),
    sendHandover: z.boolean().default(true),
  })
  .superRefine((v, ctx) => {
    if (v.buyer === "existing" && !v.buyerClientId) ctx.addIssue({ code: "custom", path: ["buyerClientId"], message: "Pick the client who bought it." });
    if (v.buyer === "new" && !v.buyerName) ctx.addIssue({ code: "custom", path: ["buyerName"], message: "Enter the buyer's name." });
  });
export type BuyerValues = z.output<typeof buyerFields>;

/** POST /api/pieces and the new-piece form: the piece, its first layers, and its buyer. */
export const deliverPieceSchema = z.intersection(createPieceSchema, buyerFields);
export type DeliverPieceInput = z.input<typeof deliverPieceSchema>;
export type DeliverPieceValues = z.output<typeof deliverPieceSchema>;

/** The hand-over link's token, as it arrives in the URL. */
export const handoverTokenSchema = z.object({ token: z.string().trim().min(20, "That link is incomplete.").max(100, "That link is incomplete.") });

/** Erasing a client asks for a ticked confirmation: it can't be undone. */
export const eraseClientSchema = z.object({
  confirm: z.literal(true, { message: "Tick the box to confirm: erasing can't be undone." }),
});

/** The piece form's schema when editing (no buyer fields), re-exported so the form loads one module. */
export { pieceSchema as pieceEditSchema } from "./pieces";
