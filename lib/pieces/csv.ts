import "server-only";
import Papa from "papaparse";
import { getDb } from "@/db/client";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import { getSpecies, resolveSpecies } from "@/lib/care/species";
import {
  FINISH_CLASSES,
  FINISH_CLASS_LABELS,
  PIECE_KINDS,
  PIECE_KIND_LABELS,
  RESIN_KINDS,
  RESIN_LABELS,
  SHAPE_KINDS,
  SUN_EXPOSURES,
  SURFACES,
  USES,
  type FinishClass,
  type PieceKind,
} from "@/lib/care/vocabulary";
import { ft2ToM2, inchesToMm } from "@/lib/care/units";
import { attachImportedBuyer, newBuyerTally, readBuyerColumns, type ImportBuyer } from "@/lib/clients/import-buyers";
import { AppError, unprocessable } from "@/lib/errors";
import { createPieceSchema, type CreatePieceValues, type ImportValues, type PieceListQuery } from "@/lib/validation/pieces";
import { insertPiece, loadFullPieces, queryRegistry, studioProducts } from "./registry";
import { formatCount } from "@/lib/format";
import { inWords } from "@/lib/validation/words";

// CSV export of the registry's current filter, and import of earlier deliveries. The import checks
// every row first and writes nothing unless the whole file is valid, then writes it in one transaction.
// Columns are the same both ways, so an export can be edited and imported into another studio.
// finish_stack: layers separated by ";", each surface:class:coats:YYYY-MM-DD[:product label].
// Sizes may come in inches instead (length_in, width_in, diameter_in, thickness_in: 96, 37.5 or
// 37 5/8) and a measured area in ft² (area_ft2); sizes implausible for the piece's kind are refused.
// Optional buyer columns (buyer_name, buyer_email, buyer_phone) match or make the piece's client.

export const CSV_COLUMNS = [
  "title",
  "kind",
  "shape",
  "length_mm",
  "width_mm",
  "diameter_mm",
  "area_m2",
  "thickness_mm",
  "primary_species",
  "secondary_species",
  "resin",
  "resin_poured_on",
  "resin_volume_ml",
  "resin_tint",
  "base_material",
  "base_finish",
  "use",
  "sun",
  "delivered_on",
  "delivery_address",
  "notes",
  "finish_stack",
] as const;
const EXPORT_ONLY = ["id", "registered", "owner_name", "owner_email", "next_care", "next_care_due", "under_warranty"] as const;

/** Spreadsheet formula injection: a cell starting with = + - @ (or tab/CR) is prefixed with '. */
export function cell(v: unknown): string {
  const s = v == null ? "" : String(v);
  return /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
}
function uncell(s: string): string {
  return /^'[=+\-@\t\r]/.test(s) ? s.slice(1) : s;
}

/** GET /api/pieces/export.csv with the same query as the registry table (every page). */
export function exportPiecesCsv(ctx: StudioContext, q: PieceListQuery, now = new Date()): string {
  const { rows } = queryRegistry(ctx, q, now, true);
  const full = loadFullPieces(rows.map((r) => r.id));
  const data = rows.map((r) => {
    const l = full.get(r.id)!;
    const p = l.piece;
    const stack = l.layers.map((x) => [x.surface, x.finishClass, x.coats, x.appliedOn, x.productLabel].filter((v, i) => i < 4 || v).join(":")).join("; ");
    const out: Record<string, string> = {
      id: p.id,
      title: p.title,
      kind: p.kind,
      shape: p.shapeKind,
      length_mm: String(p.lengthMm ?? ""),
      width_mm: String(p.widthMm ?? ""),
      diameter_mm: String(p.diameterMm ?? ""),
      area_m2: String(p.measuredAreaM2 ?? ""),
      thickness_mm: String(p.thicknessMm ?? ""),
      primary_species: p.primarySpeciesId,
      secondary_species: p.secondarySpeciesId ?? "",
      resin: p.resinKind,
      resin_poured_on: p.resinPouredOn ?? "",
      resin_volume_ml: String(p.resinVolumeMl ?? ""),
      resin_tint: p.resinTint ?? "",
      base_material: p.baseMaterial,
      base_finish: p.baseFinish,
      use: p.use,
      sun: p.sun,
      delivered_on: p.deliveredOn,
      delivery_address: p.deliveryAddress,
      notes: p.internalNotes,
      finish_stack: stack,
      registered: r.registered ? "yes" : "no",
      owner_name: r.owner?.name ?? "",
      owner_email: r.owner?.email ?? "",
      next_care: r.nextCare?.label ?? "",
      next_care_due: r.nextCare?.dueOn ?? "",
      under_warranty: r.underWarranty ? "yes" : "no",
    };
    return Object.fromEntries(Object.entries(out).map(([k, v]) => [k, cell(v)]));
  });
  return Papa.unparse({ fields: ["id", ...CSV_COLUMNS, ...EXPORT_ONLY.filter((c) => c !== "id")], data: data.map((d) => ["id", ...CSV_COLUMNS, ...EXPORT_ONLY.filter((c) => c !== "id")].map((k) => d[k] ?? "")) });
}

export type ImportError = { row: number; field: string; message: string };
export type ImportPreviewRow = { row: number; title: string; kind: string; primarySpecies: string; deliveredOn: string; layers: number; ok: boolean };
export type ImportResult = {
  ok: boolean;
  committed: boolean;
  rows: ImportPreviewRow[];
  errors: ImportError[];
  created: number;
  /** Buyers of the written rows: matched to clients on record, or new clients (lib/clients/import-buyers). */
  buyers?: { matched: number; created: number; pieceIds: string[] };
  /** Hand-over mail to the imported buyers, when asked for: sent, and not sent (no e-mail or no consent). */
  /** The hand-over mailing to the imported buyers (sent after the answer; its progress at /studio/clients/hand-over). */
  handover?: { batchId: string; total: number };
};

const norm = (s: string) => s.trim().toLowerCase().replace(/[\s_-]+/g, " ");

function enumValue<T extends string>(raw: string, values: readonly T[], labels?: Record<T, string>): T | string {
  const k = norm(raw);
  if (!k) return "";
  return values.find((v) => norm(v) === k || (labels && norm(labels[v]) === k) || (labels && norm(labels[v]).startsWith(k + " ("))) ?? raw;
}

function num(raw: string | undefined): number | null | string {
  const s = (raw ?? "").trim();
  if (!s) return null;
  const n = Number(s.replace(/,/g, ""));
  return Number.isFinite(n) ? n : s;
}

const CLASS_LABELS_SHORT: Record<FinishClass, string> = FINISH_CLASS_LABELS;

/** Inches as a woodworker writes them: "96", "37.5", "37 5/8", "5/8" (a trailing in or " is allowed). */
export function parseInches(raw: string | undefined): number | null | string {
  const s = (raw ?? "").trim().replace(/\s*(in|inch|inches|")$/i, "");
  if (!s) return null;
  const m = /^(?:(\d+(?:\.\d+)?)(?:[\s-]+(\d+)\/(\d+))?|(\d+)\/(\d+))$/.exec(s.replace(/,/g, ""));
  if (!m) return raw!.trim();
  if (m[4] !== undefined) return Number(m[5]) === 0 ? raw!.trim() : Number(m[4]) / Number(m[5]);
  const whole = Number(m[1]);
  if (m[2] === undefined) return whole;
  return Number(m[3]) === 0 ? raw!.trim() : whole + Number(m[2]) / Number(m[3]);
}

/** Lengths the import accepts in inches beside millimetres (1 in = 25.4 mm exactly, lib/care/units). */
const INCH_COLUMNS = { length_mm: "length_in", width_mm: "width_in", diameter_mm: "diameter_in", thickness_mm: "thickness_in" } as const;

/**
 * A length from its mm column or its inch column (converted, rounded to the millimetre). Both given
 * and more than 2 mm apart: an error naming both. Returns the value for the schema, or an error.
 */
function lengthFrom(r: Record<string, string>, mmColumn: keyof typeof INCH_COLUMNS): { value: number | null | string; error?: string } {
  const mm = num(r[mmColumn]);
  const inColumn = INCH_COLUMNS[mmColumn];
  const inches = parseInches(r[inColumn]);
  if (typeof inches === "string") return { value: mm, error: `${inColumn} "${inches.slice(0, 20)}" is not a number of inches (write 96, 37.5 or 37 5/8)` };
  if (inches === null) return { value: mm };
  const converted = Math.round(inchesToMm(inches));
  if (typeof mm === "number" && Math.abs(mm - converted) > 2) return { value: mm, error: `${mmColumn} (${mm}) and ${inColumn} (${r[inColumn]!.trim()} = ${converted} mm) disagree; keep one of them` };
  return { value: typeof mm === "number" ? mm : converted };
}

/**
 * Sizes a piece of each kind plausibly has, in mm (top length or diameter, width, thickness). A value
 * outside them is refused: most often inches typed into a mm column. Our own bounds, generous on
 * purpose — common practice, no published source.
 */
export const PLAUSIBLE_MM: Record<PieceKind, { length: [number, number]; width: [number, number]; thickness: [number, number] }> = {
  dining_table: { length: [600, 6000], width: [500, 2000], thickness: [15, 200] },
  coffee_table: { length: [350, 3000], width: [300, 1800], thickness: [15, 200] },
  desk: { length: [600, 4000], width: [350, 1500], thickness: [15, 150] },
  bench: { length: [400, 6000], width: [200, 1000], thickness: [20, 250] },
  countertop: { length: [300, 8000], width: [250, 1800], thickness: [10, 200] },
  console: { length: [400, 4000], width: [150, 900], thickness: [15, 150] },
  shelf: { length: [150, 4000], width: [80, 700], thickness: [10, 120] },
  other: { length: [50, 10000], width: [30, 5000], thickness: [5, 500] },
};

const DIMENSION_OF = { lengthMm: "length", diameterMm: "length", widthMm: "width", thicknessMm: "thickness" } as const;
const DIMENSION_WORDS = { lengthMm: "long", diameterMm: "across", widthMm: "wide", thicknessMm: "thick" } as const;

/** Per-row messages for sizes implausible for the kind, with the likely cause when inches were typed as mm. */
function implausibleSizes(kind: string, sizes: Partial<Record<keyof typeof DIMENSION_OF, unknown>>): { field: string; message: string }[] {
  const bounds = (PLAUSIBLE_MM as Record<string, (typeof PLAUSIBLE_MM)[PieceKind]>)[kind];
  const out: { field: string; message: string }[] = [];
  if (!bounds) return out;
  for (const [field, v] of Object.entries(sizes) as [keyof typeof DIMENSION_OF, unknown][]) {
    if (typeof v !== "number" || !Number.isFinite(v) || v <= 0) continue;
    const [min, max] = bounds[DIMENSION_OF[field]];
    if (v >= min && v <= max) continue;
    const column = FIELD_TO_COLUMN[field]!;
    const what = PIECE_KIND_LABELS[kind as PieceKind].toLowerCase();
    const asInches = Math.round(inchesToMm(v));
    const hint =
      v < min && asInches >= min && asInches <= max
        ? ` If you measured in inches, put ${v} in the ${INCH_COLUMNS[column as keyof typeof INCH_COLUMNS]} column instead (${v} in = ${formatCount(asInches)} mm).`
        : ` Check the number and its unit (millimetres).`;
    out.push({ field: column, message: `A ${what} ${formatCount(v)} mm ${DIMENSION_WORDS[field]} is ${v < min ? "too small" : "too large"} to be right (expected ${formatCount(min)}–${formatCount(max)} mm).${hint}` });
  }
  return out;
}

function parseStack(raw: string, products: { id: string; name: string; finishClass: FinishClass }[]): { layers: unknown[]; error?: string } {
  const entries = raw.split(";").map((e) => e.trim()).filter(Boolean);
  const layers: unknown[] = [];
  for (const [i, e] of entries.entries()) {
    const [surface = "", cls = "", coats = "", date = "", ...label] = e.split(":").map((x) => x.trim());
    const finishClass = enumValue(cls, FINISH_CLASSES, CLASS_LABELS_SHORT);
    const s = enumValue(surface, SURFACES);
    if (!(SURFACES as readonly string[]).includes(s)) return { layers, error: `layer ${i + 1}: surface "${surface}" is not top, base or edges` };
    if (!(FINISH_CLASSES as readonly string[]).includes(finishClass)) return { layers, error: `layer ${i + 1}: finish class "${cls}" is not one of ${FINISH_CLASSES.join(", ")}` };
    const productLabel = label.join(":");
    const product = productLabel ? products.find((p) => norm(p.name) === norm(productLabel) && p.finishClass === finishClass) : undefined;
    layers.push({ surface: s, finishClass, coats: num(coats), appliedOn: date, productLabel, productId: product?.id ?? null });
  }
  return { layers };
}

/** A measured area given in ft² (area_ft2), as m² for the record; text that is not a number is passed on for the schema to refuse. */
function ft2Area(raw: string | undefined): number | null | string {
  const v = num(raw);
  return typeof v === "number" ? Math.round(ft2ToM2(v) * 1e4) / 1e4 : v;
}

/**
 * A species column: an id, common name or alias (resolveSpecies). A trade name that can mean more than
 * one wood ("hickory", "red cedar", "poplar", "tulipwood") is never mapped silently: the row is refused
 * with the question and the values to write instead. An unknown name is passed on for the schema to refuse.
 */
function speciesCell(raw: string | undefined, column: string): { value: string; error?: string } {
  const s = (raw ?? "").trim();
  if (!s) return { value: "" };
  const m = resolveSpecies(s);
  if (m.status === "unknown") return { value: s };
  if (m.status === "found" && !m.pick) return { value: m.species.id };
  const pick = m.status === "ambiguous" ? { candidates: m.candidates, question: m.question } : m.pick!;
  const choices = pick.candidates.map((c) => `${c.id} (${c.commonName})`);
  const write = choices.length === 1 ? `If it is, write ${choices[0]} in ${column}.` : `Write one of these in ${column}: ${choices.slice(0, -1).join(", ")} or ${choices.at(-1)}.`;
  return { value: s, error: `${pick.question} ${write}` };
}

const FIELD_TO_COLUMN: Record<string, string> = {
  title: "title",
  kind: "kind",
  shapeKind: "shape",
  lengthMm: "length_mm",
  widthMm: "width_mm",
  diameterMm: "diameter_mm",
  measuredAreaM2: "area_m2",
  thicknessMm: "thickness_mm",
  primarySpeciesId: "primary_species",
  secondarySpeciesId: "secondary_species",
  resinKind: "resin",
  resinPouredOn: "resin_poured_on",
  resinVolumeMl: "resin_volume_ml",
  resinTint: "resin_tint",
  baseMaterial: "base_material",
  baseFinish: "base_finish",
  use: "use",
  sun: "sun",
  deliveredOn: "delivered_on",
  deliveryAddress: "delivery_address",
  internalNotes: "notes",
  layers: "finish_stack",
};

const MAX_ROWS = 5000;

/** POST /api/pieces/import: preview (commit false) or write (commit true) a CSV of earlier deliveries. */
export function importPiecesCsv(ctx: StudioContext, { csv, commit }: Pick<ImportValues, "csv" | "commit">): ImportResult {
  const parsed = Papa.parse<Record<string, string>>(csv.replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: "greedy", transformHeader: (h) => norm(h).replace(/ /g, "_") });
  const errors: ImportError[] = [];
  for (const e of parsed.errors.slice(0, 20)) errors.push({ row: (e.row ?? 0) + 2, field: "file", message: e.message });
  const headers = parsed.meta.fields ?? [];
  for (const required of ["title", "kind", "shape", "primary_species", "use", "delivered_on"]) {
    if (!headers.includes(required)) errors.push({ row: 1, field: required, message: `The header row has no "${required}" column.` });
  }
  if (parsed.data.length === 0 && errors.length === 0) errors.push({ row: 1, field: "file", message: "The file has a header but no rows." });
  if (parsed.data.length > MAX_ROWS) throw unprocessable("too_many_rows", `The file has ${parsed.data.length} rows; import at most ${MAX_ROWS} at a time.`);

  const products = studioProducts(ctx.studio.id).map((p) => ({ id: p.id, name: p.name, finishClass: p.finishClass }));
  const inputs: (CreatePieceValues | null)[] = [];
  const buyers: (ImportBuyer | null)[] = [];
  const rows: ImportPreviewRow[] = [];
  if (errors.length === 0) {
    parsed.data.forEach((r0, i) => {
      const rowNo = i + 2;
      const r = Object.fromEntries(Object.entries(r0).map(([k, v]) => [k, uncell(String(v ?? "")).trim()]));
      const stack = parseStack(r.finish_stack ?? "", products);
      const length = lengthFrom(r, "length_mm");
      const width = lengthFrom(r, "width_mm");
      const diameter = lengthFrom(r, "diameter_mm");
      const thickness = lengthFrom(r, "thickness_mm");
      const primary = speciesCell(r.primary_species, "primary_species");
      const secondary = speciesCell(r.secondary_species, "secondary_species");
      const candidate = {
        title: r.title ?? "",
        kind: enumValue(r.kind ?? "", PIECE_KINDS, PIECE_KIND_LABELS),
        shapeKind: enumValue(r.shape ?? "", SHAPE_KINDS),
        lengthMm: length.value,
        widthMm: width.value,
        diameterMm: diameter.value,
        measuredAreaM2: num(r.area_m2) ?? ft2Area(r.area_ft2),
        thicknessMm: thickness.value,
        primarySpeciesId: primary.value,
        secondarySpeciesId: secondary.value || null,
        resinKind: enumValue(r.resin ?? "", RESIN_KINDS, RESIN_LABELS) || "none",
        resinPouredOn: r.resin_poured_on || null,
        resinVolumeMl: num(r.resin_volume_ml),
        resinTint: r.resin_tint || null,
        baseMaterial: r.base_material ?? "",
        baseFinish: r.base_finish ?? "",
        use: enumValue(r.use ?? "", USES),
        sun: enumValue(r.sun ?? "", SUN_EXPOSURES) || "none",
        deliveredOn: r.delivered_on ?? "",
        deliveryAddress: r.delivery_address ?? "",
        internalNotes: r.notes ?? "",
        layers: stack.layers,
      };
      const result = createPieceSchema.safeParse(candidate, { error: inWords });
      const rowErrors: ImportError[] = [];
      if (stack.error) rowErrors.push({ row: rowNo, field: "finish_stack", message: stack.error });
      const buyer = readBuyerColumns(r, ctx.studio.country);
      for (const e of buyer.errors) rowErrors.push({ row: rowNo, ...e });
      buyers.push(buyer.buyer);
      for (const [column, l] of [["length_mm", length], ["width_mm", width], ["diameter_mm", diameter], ["thickness_mm", thickness], ["primary_species", primary], ["secondary_species", secondary]] as const) {
        if (l.error) rowErrors.push({ row: rowNo, field: column, message: l.error });
      }
      for (const e of implausibleSizes(String(candidate.kind), { lengthMm: candidate.lengthMm, widthMm: candidate.widthMm, diameterMm: candidate.diameterMm, thicknessMm: candidate.thicknessMm })) {
        rowErrors.push({ row: rowNo, ...e });
      }
      if (!result.success) {
        for (const issue of result.error.issues) {
          const [first, idx, sub] = issue.path.map(String);
          const column = FIELD_TO_COLUMN[first ?? ""] ?? first ?? "row";
          if (column.endsWith("_species") && rowErrors.some((e) => e.field === column)) continue; // already asked which wood
          const where = first === "layers" && idx !== undefined ? ` (layer ${Number(idx) + 1}${sub ? `, ${sub}` : ""})` : "";
          const given = first && first !== "layers" ? (candidate as Record<string, unknown>)[first] : undefined;
          const shown = typeof given === "string" && given && issue.code !== "custom" ? ` — got "${given.slice(0, 40)}"` : "";
          rowErrors.push({ row: rowNo, field: column, message: `${issue.message}${where}${shown}` });
        }
      }
      errors.push(...rowErrors);
      rows.push({ row: rowNo, title: candidate.title, kind: String(candidate.kind), primarySpecies: getSpecies(candidate.primarySpeciesId)?.commonName ?? candidate.primarySpeciesId, deliveredOn: candidate.deliveredOn, layers: stack.layers.length, ok: rowErrors.length === 0 });
      inputs.push(result.success ? result.data : null);
    });
  }
  if (errors.length > 0 || !commit) return { ok: errors.length === 0, committed: false, rows, errors, created: 0 };

  const db = getDb();
  const tally = newBuyerTally();
  try {
    db.transaction((tx) => {
      inputs.forEach((input, i) => {
        const { piece } = insertPiece(ctx, tx, input!, "import"); // every row parsed: one that didn't is an error, and errors return above
        if (buyers[i]) attachImportedBuyer(ctx, tx, piece.id, buyers[i], tally);
      });
      recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "pieces.imported", subjectType: "studio", subjectId: ctx.studio.id, data: { rows: inputs.length } });
    });
  } catch (e) {
    // A row that passed the checks but failed on write (e.g. a product reference): nothing was written.
    if (e instanceof AppError) {
      const field = Object.keys(e.fieldErrors ?? {})[0] ?? "row";
      return { ok: false, committed: false, rows, errors: [{ row: 0, field, message: e.message }], created: 0 };
    }
    throw e;
  }
  return { ok: true, committed: true, rows, errors: [], created: inputs.length, buyers: { matched: tally.matched, created: tally.created, pieceIds: tally.pieceIds } };
}
