import { Canvas, Document, Font, Page, Path, StyleSheet, Svg, Text, View, renderToBuffer } from "@react-pdf/renderer";
import { and, eq, inArray, isNull } from "drizzle-orm";
import QRCode from "qrcode";
import { getDb } from "@/db/client";
import { careLogEntries, finishLayers, pieces, type FinishProduct, type Piece } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { curingLayers } from "@/lib/care/cure";
import { PIECE_KIND_LABELS } from "@/lib/care/vocabulary";
import { env } from "@/lib/env";
import { notFound, unprocessable } from "@/lib/errors";
import { formatDate } from "@/lib/format";
import { careBasics } from "./care-basics";
import { pdfBrandOf, PdfBrandHeader, type PdfBrand } from "./card-brand";
import { CARE_RECORDS_BY, CODE_WHEN_PIECE_CHANGES_HANDS } from "./card-words";
import { scheduleFromRows } from "./care-inputs";
import { loadPiece, studioProducts } from "./registry-common";
import { openRegistrationCode } from "./registration";

// The drawer card: a printable card that travels in the piece's drawer, 4 × 6 in (288 × 432 pt) or
// A6 (105 × 148 mm), one per page for a card printer or several per Letter / A4 sheet with cut marks.
// Text is real PDF text (Helvetica/Courier), so it can be searched and read by assistive tools; the
// QR code of APP_URL/r/<code> is painted as vector squares (no image to encode or decode).
//
// Fitting: the header (brand, a title of at most two lines, one subtitle line) and the code box have
// fixed heights, so only the body (curing, care basics, coming up, caution) varies. A body is tried
// on a page of the card's size at the largest type first; while it runs onto a second page, the next
// tighter level is tried (the last level is the floor). The level found is kept per body and size for
// the process, dates written as the widest date, so a batch of cards with the same finishes measures once.

// Whole words only: hyphenated "some- where" reads badly on a small card. A word longer than any line
// can hold (a 60-letter title or studio name with no space) may break after any letter instead, so it
// wraps inside the card rather than running off its edge.
const LONGEST_UNBROKEN_WORD = 18;
Font.registerHyphenationCallback((word) => (word.length > LONGEST_UNBROKEN_WORD ? [...word] : [word]));

export const CARD_SIZES = { "4x6": [288, 432] as [number, number], a6: [297.64, 419.53] as [number, number] };
export type CardSize = keyof typeof CARD_SIZES;

/** One card per page (a card printer), or sheets of cards with cut marks. */
export const CARD_LAYOUTS = ["4x6", "a6", "letter", "a4"] as const;
export type CardLayout = (typeof CARD_LAYOUTS)[number];
/** Letter (8.5 × 11 in) holds two 4 × 6 in cards; A4 (210 × 297 mm) holds four A6 cards, edge to edge. */
const SHEETS = {
  letter: { page: [612, 792] as [number, number], card: "4x6" as CardSize, cols: 2, rows: 1 },
  a4: { page: [595.28, 841.89] as [number, number], card: "a6" as CardSize, cols: 2, rows: 2 },
} as const;

/** At most this many cards in one PDF (a batch of a studio's first hundred pieces, and room to spare). */
export const MAX_CARDS_PER_PDF = 200;

export function registrationUrl(code: string): string {
  return `${env.APP_URL.replace(/\/$/, "")}/r/${code}`;
}

/** Where a code is typed by hand: the install's address without its scheme, for reading off a card. */
function typeCodeAt(): string {
  return `${env.APP_URL.replace(/\/$/, "").replace(/^https?:\/\//, "")}/register`;
}

export type CardData = {
  studioName: string;
  title: string;
  subtitle: string;
  code: string;
  url: string;
  basics: string[];
  cautions: string[];
  hasOil: boolean;
  /** Care coming up, due today or later in the studio's zone (never a date already past). */
  schedule: string[];
  /** While the delivered finish cures: until when to go gently, and from when it takes full use. */
  curing: string | null;
};

// ---- layout ----

const PAD = 16;
const FOOT_H = 30;
const QR = 76;

/** Tighter levels: smaller type first, then fewer "coming up" lines, then the basics cut to the first few. */
const LEVELS = [
  { font: 7.5, schedule: 3, basics: 99 },
  { font: 7, schedule: 3, basics: 99 },
  { font: 6.6, schedule: 2, basics: 99 },
  { font: 6.3, schedule: 1, basics: 4 },
  { font: 6, schedule: 1, basics: 3 },
] as const;
type Level = (typeof LEVELS)[number];

const s = StyleSheet.create({
  face: { paddingTop: PAD, paddingHorizontal: PAD, paddingBottom: PAD + FOOT_H, fontFamily: "Helvetica", color: "#1f2328", backgroundColor: "#ffffff" },
  title: { fontSize: 12.5, lineHeight: 1.15, fontFamily: "Helvetica-Bold", marginTop: 4, height: 12.5 * 1.15 * 2, maxLines: 2, textOverflow: "ellipsis" },
  sub: { fontSize: 7.5, color: "#625b50", height: 10, maxLines: 1, textOverflow: "ellipsis" },
  codeBox: { marginTop: 6, flexDirection: "row", alignItems: "center", borderWidth: 1, borderColor: "#e4dccf", borderRadius: 4, padding: 5, height: QR + 12 },
  codeCol: { marginLeft: 7, flexGrow: 1, flexShrink: 1, flexBasis: 0 },
  label: { fontSize: 6.5, color: "#625b50", letterSpacing: 0.6 },
  code: { fontFamily: "Courier-Bold", fontSize: 12, marginTop: 2, marginBottom: 3 },
  how: { fontSize: 6.5, lineHeight: 1.25, color: "#625b50" },
  at: { fontFamily: "Courier", fontSize: 6.5, lineHeight: 1.25, color: "#1f2328" },
  li: { flexDirection: "row", marginBottom: 2 },
  bullet: { width: 7 },
  caution: { marginTop: 5, padding: 4, borderWidth: 1, borderColor: "#8a4b00", borderRadius: 4, backgroundColor: "#fbefdc" },
  foot: { position: "absolute", bottom: 10, left: PAD, right: PAD, height: FOOT_H - 4, fontSize: 5.8, lineHeight: 1.25, color: "#625b50" },
  by: { fontSize: 5.5, color: "#857d70", marginTop: 1 },
});

/** The QR code as vector squares (one rectangle per run of dark modules) on white, with a two-module quiet zone. */
function QrCode({ url, size }: { url: string; size: number }) {
  const { modules } = QRCode.create(url, { errorCorrectionLevel: "M" });
  const n = modules.size;
  const q = 2;
  const runs: [number, number, number][] = [];
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; ) {
      if (!modules.get(r, c)) {
        c++;
        continue;
      }
      let run = 1;
      while (c + run < n && modules.get(r, c + run)) run++;
      runs.push([c + q, r + q, run]);
      c += run;
    }
  }
  // Painted straight onto the page (react-pdf's Canvas), with no SVG path to parse.
  const paint = (p: { rect: (x: number, y: number, w: number, h: number) => typeof p; fill: (c: string) => typeof p }, w: number) => {
    const m = w / (n + 2 * q);
    p.rect(0, 0, w, w).fill("#ffffff");
    for (const [x, y, len] of runs) p.rect(x * m, y * m, len * m, m);
    p.fill("#000000");
    return null;
  };
  return <Canvas style={{ width: size, height: size }} paint={paint} />;
}

/** A long address in lines of at most `max` characters, broken after a "/" or "." where it can be. */
function addressLines(address: string, max: number): string {
  const lines: string[] = [];
  let rest = address;
  while (rest.length > max) {
    const head = rest.slice(0, max);
    const cut = Math.max(head.lastIndexOf("/"), head.lastIndexOf("."));
    const at = cut > max / 3 ? cut + 1 : max;
    lines.push(rest.slice(0, at));
    rest = rest.slice(at);
  }
  lines.push(rest);
  return lines.join("\n");
}

function Bullets({ items, font }: { items: string[]; font: number }) {
  return (
    <View>
      {items.map((t, i) => (
        <View key={i} style={s.li} wrap={false}>
          <Text style={[s.bullet, { fontSize: font }]}>•</Text>
          <Text style={{ flexGrow: 1, flexShrink: 1, flexBasis: 0, fontSize: font, lineHeight: 1.28 }}>{t}</Text>
        </View>
      ))}
    </View>
  );
}

/** The card's content, laid out for a box `width` points wide. */
function CardFace({ data, brand, level, width, onOwnPage }: { data: CardData; brand: PdfBrand; level: Level; width: number; onOwnPage: boolean }) {
  const h = { fontSize: level.font + 1, fontFamily: "Helvetica-Bold", marginTop: 5, marginBottom: 1.5 };
  const basics = data.basics.length > level.basics ? [...data.basics.slice(0, level.basics), "More care advice comes with the piece's care plan once it is registered."] : data.basics;
  // Courier is 0.6 em wide: as many characters as fit beside the QR code.
  const columnWidth = width - 2 * PAD - 12 - QR - 7;
  return (
    <>
      <PdfBrandHeader brand={brand} fontSize={8} logoHeight={18} />
      <Text style={s.title}>
        {data.title}
      </Text>
      <Text style={s.sub}>
        {data.subtitle}
      </Text>
      <View style={s.codeBox} wrap={false}>
        <QrCode url={data.url} size={QR} />
        <View style={s.codeCol}>
          <Text style={s.label}>REGISTRATION CODE</Text>
          <Text style={s.code}>{data.code}</Text>
          <Text style={s.how}>Scan the QR code, or type the code at</Text>
          <Text style={s.at}>{addressLines(typeCodeAt(), Math.floor(columnWidth / (0.6 * 6.5)) - 1)}</Text>
          <Text style={s.how}>to get this piece&apos;s care reminders.</Text>
        </View>
      </View>
      {data.curing ? (
        <>
          <Text style={h}>The finish is still curing</Text>
          <Bullets items={[data.curing]} font={level.font} />
        </>
      ) : null}
      <Text style={h}>Caring for this piece</Text>
      <Bullets items={basics} font={level.font} />
      {data.schedule.length ? (
        <>
          <Text style={h}>Coming up</Text>
          <Bullets items={data.schedule.slice(0, level.schedule)} font={level.font} />
        </>
      ) : null}
      <View style={s.caution} wrap={false}>
        <Text style={{ fontFamily: "Helvetica-Bold", fontSize: level.font + 0.5, marginBottom: 1.5 }}>{data.hasOil ? "Caution — oily rags and finishes" : "Caution"}</Text>
        {/* One paragraph: the card is small, and each caution is one short sentence. */}
        <Text style={{ fontSize: level.font, lineHeight: 1.28 }}>{data.cautions.join(" ")}</Text>
      </View>
      {/* On its own page the foot is "fixed", so it takes no room from the flow the fit is measured by. */}
      <View style={s.foot} fixed={onOwnPage}>
        <Text>Keep this card with the piece. {CODE_WHEN_PIECE_CHANGES_HANDS}</Text>
        <Text style={s.by}>{CARE_RECORDS_BY}</Text>
      </View>
    </>
  );
}

function docProps(title: string, brand: PdfBrand) {
  return { title, author: brand.name, subject: "Drawer card", creator: "Grainward", producer: "Grainward" };
}

/** One card per page, each page the card's size. */
function CardPages({ cards, brand, size, levels }: { cards: CardData[]; brand: PdfBrand; size: CardSize; levels: Level[] }) {
  const [w, h] = CARD_SIZES[size];
  return (
    <Document {...docProps(cards.length === 1 ? `Drawer card — ${cards[0]!.title}` : `Drawer cards (${cards.length})`, brand)}>
      {cards.map((card, i) => (
        <Page key={i} size={[w, h]} style={s.face}>
          <CardFace data={card} brand={brand} level={levels[i]!} width={w} onOwnPage />
        </Page>
      ))}
    </Document>
  );
}

/** Cut marks: short ticks outside each cut line at the sheet's edges, and crosses where cuts meet inside. */
function CutMarks({ sheet }: { sheet: (typeof SHEETS)[keyof typeof SHEETS] }) {
  const [pw, ph] = sheet.page;
  const [cw, ch] = CARD_SIZES[sheet.card];
  const x0 = (pw - sheet.cols * cw) / 2;
  const y0 = (ph - sheet.rows * ch) / 2;
  const xs = Array.from({ length: sheet.cols + 1 }, (_, i) => x0 + i * cw);
  const ys = Array.from({ length: sheet.rows + 1 }, (_, i) => y0 + i * ch);
  const tick = 12;
  let d = "";
  for (const x of xs) {
    // Along the top and bottom edges (only where there is margin to print in).
    if (y0 > 4) d += `M${x} ${Math.max(0, y0 - tick - 3)}V${y0 - 3}M${x} ${ys.at(-1)! + 3}V${Math.min(ph, ys.at(-1)! + 3 + tick)}`;
    else d += `M${x} 2V${2 + tick}M${x} ${ph - 2 - tick}V${ph - 2}`;
  }
  for (const y of ys) {
    if (x0 > 4) d += `M${Math.max(0, x0 - tick - 3)} ${y}H${x0 - 3}M${xs.at(-1)! + 3} ${y}H${Math.min(pw, xs.at(-1)! + 3 + tick)}`;
    else d += `M2 ${y}H${2 + tick}M${pw - 2 - tick} ${y}H${pw - 2}`;
  }
  for (const x of xs.slice(1, -1)) for (const y of ys.slice(1, -1)) d += `M${x - 5} ${y}H${x + 5}M${x} ${y - 5}V${y + 5}`;
  return (
    <Svg fixed style={{ position: "absolute", left: 0, top: 0, width: pw, height: ph }} viewBox={`0 0 ${pw} ${ph}`}>
      <Path d={d} stroke="#777777" strokeWidth={0.5} />
    </Svg>
  );
}

/** Sheets of cards side by side, each card in a box the size of its one-per-page card. */
function CardSheets({ cards, brand, sheet, levels }: { cards: CardData[]; brand: PdfBrand; sheet: (typeof SHEETS)[keyof typeof SHEETS]; levels: Level[] }) {
  const [pw, ph] = sheet.page;
  const [cw, ch] = CARD_SIZES[sheet.card];
  const perSheet = sheet.cols * sheet.rows;
  const x0 = (pw - sheet.cols * cw) / 2;
  const y0 = (ph - sheet.rows * ch) / 2;
  const pages = Array.from({ length: Math.ceil(cards.length / perSheet) }, (_, p) => cards.slice(p * perSheet, (p + 1) * perSheet));
  return (
    <Document {...docProps(`Drawer cards (${cards.length})`, brand)}>
      {pages.map((onSheet, p) => (
        <Page key={p} size={[pw, ph]} style={{ backgroundColor: "#ffffff" }}>
          {onSheet.map((card, i) => (
            <View
              key={i}
              wrap={false}
              style={[s.face, { position: "absolute", left: x0 + (i % sheet.cols) * cw, top: y0 + Math.floor(i / sheet.cols) * ch, width: cw, height: ch }]}
            >
              <CardFace data={card} brand={brand} level={levels[p * perSheet + i]!} width={cw} onOwnPage={false} />
            </View>
          ))}
          <CutMarks sheet={sheet} />
        </Page>
      ))}
    </Document>
  );
}

// ---- fitting ----

function pageCount(pdf: Buffer): number {
  return pdf.toString("latin1").match(/\/Type\s*\/Page(?![s\w])/g)?.length ?? 0;
}

const FIT_CACHE_MAX = 500;
const fitCache = new Map<string, number>();

const A_DATE = /\b\d{1,2} (January|February|March|April|May|June|July|August|September|October|November|December) \d{4}\b/g;

/**
 * The card as it is measured: every date written as the widest one ("28 September 2027"), so that one
 * measurement holds for every piece with the same finishes and the same kind of schedule, whatever
 * its dates (a shorter date never needs more lines).
 */
function measuredBody(card: CardData): CardData {
  const widest = (s: string) => s.replace(A_DATE, "28 September 2027");
  return { ...card, curing: card.curing && widest(card.curing), schedule: card.schedule.map(widest) };
}

function fitKey(card: CardData, size: CardSize, brand: PdfBrand): string {
  // Everything but the title (two fixed lines) and the code (fixed width in Courier) decides the height.
  return JSON.stringify([size, !!brand.logo, card.curing, card.basics, card.schedule, card.cautions, card.hasOil]);
}

/** The loosest level at which the card fits one page of `size` (measured once per body and size). */
async function fitLevel(card: CardData, brand: PdfBrand, size: CardSize): Promise<number> {
  const body = measuredBody(card);
  const key = fitKey(body, size, brand);
  const known = fitCache.get(key);
  if (known !== undefined) return known;
  let level = 0;
  for (; level < LEVELS.length - 1; level++) {
    const pdf = await renderToBuffer(<CardPages cards={[body]} brand={brand} size={size} levels={[LEVELS[level]!]} />);
    if (pageCount(pdf) === 1) break;
  }
  if (fitCache.size >= FIT_CACHE_MAX) fitCache.delete(fitCache.keys().next().value!);
  fitCache.set(key, level);
  return level;
}

// ---- data ----

type CardInputs = { piece: Piece; products: FinishProduct[]; now: Date };

function cardData(ctx: StudioContext, { piece, products, now }: CardInputs): CardData {
  const db = getDb();
  const layers = db.select().from(finishLayers).where(and(eq(finishLayers.pieceId, piece.id), eq(finishLayers.studioId, ctx.studio.id))).all();
  const careLog = db.select().from(careLogEntries).where(eq(careLogEntries.pieceId, piece.id)).all();
  const code = openRegistrationCode(piece.registrationCodeEnc);
  const { basics, cautions, hasOil } = careBasics(layers.map((l) => l.finishClass), piece.resinKind, piece.use);
  let schedule: string[] = [];
  let curing: string | null = null;
  try {
    const plan = scheduleFromRows({ piece, layers, careLog, products, timeZone: ctx.studio.timeZone, now });
    // Only what is still ahead on the day the card is printed, in the studio's zone.
    schedule = plan.tasks
      .filter((t) => t.dueOn >= plan.today)
      .sort((a, b) => a.dueOn.localeCompare(b.dueOn))
      .slice(0, 3)
      .map((t) => `${t.label}${t.surface === "whole_piece" ? "" : ` (${t.surface === "base" ? "base" : "top"})`}: due ${formatDate(t.dueOn)}`);
    const fresh = curingLayers(layers, products, plan.today);
    if (fresh.length) {
      const light = fresh.map((w) => w.lightUseOn).sort().at(-1)!;
      const full = fresh[0]!.fullUseOn;
      curing =
        light > plan.today
          ? `Keep water, mats and objects off it until ${formatDate(light)}, then use it gently; full use (children, heavy dishes, wiping with water) from ${formatDate(full)}. A slightly tacky feel until then is normal.`
          : `Use it gently for now; full use (children, heavy dishes, wiping with water) from ${formatDate(full)}. A slightly tacky feel until then is normal.`;
    }
  } catch {
    schedule = [];
  }
  return {
    studioName: ctx.studio.name,
    title: piece.title,
    subtitle: `${PIECE_KIND_LABELS[piece.kind]} · delivered ${formatDate(piece.deliveredOn)}`,
    code,
    url: registrationUrl(code),
    basics,
    cautions,
    hasOil,
    schedule,
    curing,
  };
}

/** What the card of one of the studio's pieces says (404 for another studio's piece). */
export async function drawerCardData(ctx: StudioContext, pieceId: string, now = new Date()): Promise<CardData> {
  return cardData(ctx, { piece: loadPiece(ctx, pieceId), products: studioProducts(ctx.studio.id), now });
}

function fileSlug(title: string): string {
  return title.toLowerCase().replace(/[^a-z0-9]+/g, "-").replace(/^-|-$/g, "").slice(0, 60) || "piece";
}

/** GET /api/pieces/[id]/card.pdf: one card on one page of its size. */
export async function renderDrawerCard(ctx: StudioContext, pieceId: string, size: CardSize = "4x6", now = new Date()): Promise<{ pdf: Buffer; filename: string }> {
  const [data, brand] = await Promise.all([drawerCardData(ctx, pieceId, now), pdfBrandOf(ctx.studio)]);
  const level = await fitLevel(data, brand, size);
  const pdf = await renderToBuffer(<CardPages cards={[data]} brand={brand} size={size} levels={[LEVELS[level]!]} />);
  return { pdf, filename: `drawer-card-${fileSlug(data.title)}${size === "a6" ? "-a6" : ""}.pdf` };
}

/** Which pieces to print: chosen ids (in that order), or every piece not yet registered (oldest delivery first). */
export type CardSelection = { ids: string[] } | { unregistered: true };

/** The studio's pieces for a batch; an id that is not one of the studio's pieces is a 404 and nothing is printed. */
function batchPieces(ctx: StudioContext, selection: CardSelection): Piece[] {
  const db = getDb();
  if ("ids" in selection) {
    const ids = [...new Set(selection.ids)];
    if (ids.length === 0) throw unprocessable("no_pieces", "Choose at least one piece to print its card.");
    if (ids.length > MAX_CARDS_PER_PDF) throw unprocessable("too_many_cards", `Print at most ${MAX_CARDS_PER_PDF} cards at a time.`);
    const rows = db.select().from(pieces).where(and(eq(pieces.studioId, ctx.studio.id), inArray(pieces.id, ids))).all();
    if (rows.length !== ids.length) throw notFound("One of those pieces isn't in your registry any more. Reload the registry and choose again.");
    const byId = new Map(rows.map((r) => [r.id, r]));
    return ids.map((id) => byId.get(id)!);
  }
  const rows = db
    .select()
    .from(pieces)
    .where(and(eq(pieces.studioId, ctx.studio.id), isNull(pieces.ownerId), isNull(pieces.archivedAt)))
    .orderBy(pieces.deliveredOn, pieces.title)
    .limit(MAX_CARDS_PER_PDF + 1)
    .all();
  if (rows.length === 0) throw unprocessable("no_pieces", "Every piece is registered: there is no card left to print.");
  if (rows.length > MAX_CARDS_PER_PDF) {
    throw unprocessable("too_many_cards", `More than ${MAX_CARDS_PER_PDF} pieces are not yet registered. Choose up to ${MAX_CARDS_PER_PDF} of them in the registry and print those.`);
  }
  return rows;
}

/** GET /api/pieces/cards: one PDF of many cards, one per page or in sheets with cut marks. */
export async function renderDrawerCards(ctx: StudioContext, selection: CardSelection, layout: CardLayout, now = new Date()): Promise<{ pdf: Buffer; filename: string; count: number }> {
  const chosen = batchPieces(ctx, selection);
  const products = studioProducts(ctx.studio.id);
  const brand = await pdfBrandOf(ctx.studio);
  const cards = chosen.map((piece) => cardData(ctx, { piece, products, now }));
  const size: CardSize = layout === "letter" || layout === "a4" ? SHEETS[layout].card : layout;
  const levels: Level[] = [];
  for (const card of cards) levels.push(LEVELS[await fitLevel(card, brand, size)]!);
  const doc = layout === "letter" || layout === "a4" ? <CardSheets cards={cards} brand={brand} sheet={SHEETS[layout]} levels={levels} /> : <CardPages cards={cards} brand={brand} size={layout} levels={levels} />;
  const pdf = await renderToBuffer(doc);
  const what = layout === "letter" ? "letter-sheets" : layout === "a4" ? "a4-sheets" : layout;
  return { pdf, filename: `drawer-cards-${cards.length}-${what}.pdf`, count: cards.length };
}
