// The piece registry's schemas, shared by the forms (react-hook-form's zod resolver), the route
// handlers and the CSV import. Lengths are millimetres, volumes millilitres, dates "YYYY-MM-DD".
import { z } from "zod";
import { getSpecies } from "@/lib/care/species";
import { FINISH_CLASSES, PIECE_KINDS, RESIN_KINDS, SHAPE_KINDS, SUN_EXPOSURES, SURFACES, USES } from "@/lib/care/vocabulary";
import { filterDate, pastDate } from "./dates";
import { patchOf } from "./patch";
import { PAGE_SIZES, SORTS } from "./piece-list-keys";

/** A delivery, pour or finish-layer date: it has happened (1900 to tomorrow). */
const pastOn = pastDate();
const optionalDate = pastOn.nullable().optional();

/** A number the form needs: left empty (the forms send null) it asks for it; anything else not a number says so. */
const neededNumber = (empty: string, notNumber: string) => z.number({ error: (issue) => (issue.input == null ? empty : notNumber) });

const lengthMm = (label: string, max = 20_000) =>
  z
    .number({ error: `${label} must be a number.` })
    .int(`${label}: whole millimetres.`)
    .positive(`${label} must be more than 0.`)
    .max(max, `${label} is more than ${max / 1000} m; check the unit.`)
    .nullable()
    .optional();

const speciesId = z
  .string({ error: "Pick a species." })
  .trim()
  .min(1, "Pick a species.")
  .refine((id) => getSpecies(id) !== undefined, "Pick a species from the list.");

const text = (max: number) => z.string().trim().max(max, `Use at most ${max} characters.`);

export const pieceFields = z.object({
  kind: z.enum(PIECE_KINDS, { error: "Pick a kind of piece." }),
  title: text(200).min(1, "Give the piece a title."),
  shapeKind: z.enum(SHAPE_KINDS, { error: "Pick a shape." }),
  lengthMm: lengthMm("Length"),
  widthMm: lengthMm("Width"),
  diameterMm: lengthMm("Diameter"),
  measuredAreaM2: z
    .number({ error: "Area must be a number." })
    .positive("Area must be more than 0.")
    .max(50, "Area is more than 50 m²; check the unit.")
    .nullable()
    .optional(),
  thicknessMm: lengthMm("Thickness", 1_000),
  primarySpeciesId: speciesId,
  secondarySpeciesId: speciesId.nullable().optional(),
  resinKind: z.enum(RESIN_KINDS).default("none"),
  resinPouredOn: optionalDate,
  resinVolumeMl: z
    .number({ error: "Volume must be a number." })
    .int("Volume: whole millilitres.")
    .positive("Volume must be more than 0.")
    .max(1_000_000, "Volume is more than 1,000 L; check the unit.")
    .nullable()
    .optional(),
  resinTint: text(80).nullable().optional(),
  baseMaterial: text(200).default(""),
  baseFinish: text(200).default(""),
  use: z.enum(USES, { error: "Pick how the piece is used." }),
  sun: z.enum(SUN_EXPOSURES).default("none"),
  deliveredOn: pastOn,
  deliveryAddress: text(500).default(""),
  internalNotes: text(5000).default(""),
});

type PieceShape = Pick<z.output<typeof pieceFields>, "shapeKind" | "lengthMm" | "widthMm" | "diameterMm" | "measuredAreaM2" | "resinKind" | "resinPouredOn" | "deliveredOn" | "primarySpeciesId" | "secondarySpeciesId">;

/** The sizes a shape needs, and the resin/delivery dates in order. */
export function checkPieceConsistency(v: PieceShape, ctx: { addIssue: (i: { code: "custom"; message: string; path: string[] }) => void }) {
  const need = (field: keyof PieceShape, message: string) => {
    if (v[field] == null) ctx.addIssue({ code: "custom", message, path: [field] });
  };
  if (v.shapeKind === "rectangle" || v.shapeKind === "oval") {
    need("lengthMm", "Enter the length.");
    need("widthMm", "Enter the width.");
  } else if (v.shapeKind === "round") need("diameterMm", "Enter the diameter.");
  else if (v.shapeKind === "measured") need("measuredAreaM2", "Enter the measured area.");
  if (v.resinKind !== "none" && v.resinPouredOn && v.deliveredOn && v.resinPouredOn > v.deliveredOn) {
    ctx.addIssue({ code: "custom", message: "The pour date is after the delivery date.", path: ["resinPouredOn"] });
  }
  if (v.secondarySpeciesId && v.secondarySpeciesId === v.primarySpeciesId) {
    ctx.addIssue({ code: "custom", message: "The secondary species is the same as the primary.", path: ["secondarySpeciesId"] });
  }
}

export const pieceSchema = pieceFields.superRefine(checkPieceConsistency);
export type PieceInput = z.input<typeof pieceSchema>;
export type PieceValues = z.output<typeof pieceSchema>;

/** PATCH: any subset of the fields (the merged record is checked with pieceSchema), plus archiving. */
export const piecePatchSchema = patchOf(pieceFields).extend({ archived: z.boolean().optional() });
export type PiecePatch = z.output<typeof piecePatchSchema>;

export const layerFields = z.object({
  surface: z.enum(SURFACES, { error: "Pick a surface." }),
  finishClass: z.enum(FINISH_CLASSES, { error: "Pick a finish class." }),
  productId: z.string().trim().max(64).nullable().optional(),
  productLabel: text(200).default(""),
  coats: neededNumber("Enter the number of coats.", "Coats must be a number.").int("Whole coats.").min(1, "At least one coat.").max(20, "At most 20 coats."),
  appliedOn: pastOn,
  appliedById: z.string().trim().max(64).nullable().optional(),
  batchLot: text(100).default(""),
  notes: text(2000).default(""),
});
export const layerSchema = layerFields;
export type LayerInput = z.input<typeof layerSchema>;
export type LayerValues = z.output<typeof layerSchema>;

/** PATCH of a layer: fields, and `position` to move it within its surface (0 = closest to the wood). */
export const layerPatchSchema = patchOf(layerFields).extend({ position: z.number().int().min(0).max(200).optional() });
export type LayerPatch = z.output<typeof layerPatchSchema>;

/** A new piece, optionally with its first finish layers (the CSV import and API clients use this). */
export const createPieceSchema = pieceFields
  .extend({ layers: z.array(layerFields).max(30, "At most 30 layers.").optional() })
  .superRefine(checkPieceConsistency);
export type CreatePieceInput = z.input<typeof createPieceSchema>;
export type CreatePieceValues = z.output<typeof createPieceSchema>;

export { PAGE_SIZES, SORTS };

/** The registry table's state: also its URL's query string. Empty strings count as absent. */
export const pieceListQuerySchema = z.preprocess(
  (raw) => (raw && typeof raw === "object" ? Object.fromEntries(Object.entries(raw).filter(([, v]) => v !== "" && v != null)) : raw),
  z.object({
    q: z.string().max(200, "Search for at most 200 characters.").default(""),
    kind: z.enum(PIECE_KINDS).optional(),
    species: speciesId.optional(),
    finishClass: z.enum(FINISH_CLASSES).optional(),
    registered: z.enum(["yes", "no"]).optional(),
    dueBefore: filterDate().optional(),
    warranty: z.enum(["active", "ended"]).optional(),
    archived: z.enum(["hide", "only"]).default("hide"),
    sort: z.enum(SORTS).optional(),
    dir: z.enum(["asc", "desc"]).optional(),
    page: z.coerce.number().int().min(1).max(100_000).default(1),
    pageSize: z.coerce
      .number()
      .int()
      .refine((n) => (PAGE_SIZES as readonly number[]).includes(n), "Page size is 10, 25, 50 or 100.")
      .default(25),
  }),
);
export type PieceListQuery = z.output<typeof pieceListQuerySchema>;

export const importSchema = z.object({
  csv: z.string().min(1, "The file is empty.").max(2_000_000, "The file is larger than 2 MB; split it."),
  commit: z.boolean().default(false),
  /** Send the imported buyers their hand-over mail once the rows are written (those who can get it). */
  sendHandover: z.boolean().default(false),
});
export type ImportValues = z.output<typeof importSchema>;

export const catalogProductSchema = z.object({
  name: text(120).min(1, "Give the product a name."),
  finishClass: z.enum(FINISH_CLASSES, { error: "Pick a finish class." }),
  coverageM2PerL: neededNumber("Enter the coverage.", "Coverage must be a number.").positive("Coverage must be more than 0.").max(1000, "Coverage above 1,000 m²/L; check the unit."),
  containers: z
    .array(
      z.object({
        ml: neededNumber("Enter the size.", "Size must be a number.").int("Whole millilitres.").positive("Size must be more than 0.").max(100_000, "At most 100,000 mL (100 L) a container."),
        priceMinor: neededNumber("Enter the price.", "Price must be a number.").int("Price in whole cents.").min(0, "Price can't be negative.").max(100_000_000, "That price is too large."),
      }),
    )
    .max(10, "At most 10 container sizes.")
    .default([]),
  intervalHeavyMonths: z.number({ error: "Months must be a number." }).int("Whole months.").min(1, "At least 1 month.").max(240, "At most 240 months (20 years).").nullable().optional(),
  intervalModerateMonths: z.number({ error: "Months must be a number." }).int("Whole months.").min(1, "At least 1 month.").max(240, "At most 240 months (20 years).").nullable().optional(),
  intervalLightMonths: z.number({ error: "Months must be a number." }).int("Whole months.").min(1, "At least 1 month.").max(240, "At most 240 months (20 years).").nullable().optional(),
  safetyNotes: text(2000).default(""),
  /** From the product's label; empty keeps the finish class's default (lib/care/cure.ts). */
  cureLightUseHours: z.number({ error: "Hours must be a number." }).int("Whole hours.").min(1, "At least 1 hour.").max(24 * 60, "At most 60 days in hours.").nullable().optional(),
  cureFullDays: z.number({ error: "Days must be a number." }).int("Whole days.").min(1, "At least 1 day.").max(365, "At most 365 days.").nullable().optional(),
});
export type CatalogProductInput = z.input<typeof catalogProductSchema>;
export const catalogPatchSchema = patchOf(catalogProductSchema).extend({ archived: z.boolean().optional() });
export type CatalogPatch = z.output<typeof catalogPatchSchema>;

export const idParam = z.object({ id: z.string().min(1).max(64) });
export const layerParams = z.object({ id: z.string().min(1).max(64), layerId: z.string().min(1).max(64) });
