import "server-only";
import { Document, Font, Image, Page, StyleSheet, Text, View, renderToBuffer } from "@react-pdf/renderer";
import { and, eq } from "drizzle-orm";
import QRCode from "qrcode";
import { getDb } from "@/db/client";
import { careLogEntries, finishLayers } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { curingLayers } from "@/lib/care/cure";
import { PIECE_KIND_LABELS } from "@/lib/care/vocabulary";
import { formatDate } from "@/lib/owner/format";
import { env } from "@/lib/env";
import { careBasics } from "./care-basics";
import { scheduleFromRows } from "./care-inputs";
import { loadPiece, studioProducts } from "./registry";
import { openRegistrationCode } from "./registration";

// The drawer card: a printable card that travels in the piece's drawer. 4 × 6 in by
// default (288 × 432 pt), or A6. Text is real PDF text (Helvetica/Courier), so it can be searched
// and read by assistive tools; the QR code is a PNG of APP_URL/r/<code>.

// Whole words only: hyphenated "some- where" reads badly on a small card.
Font.registerHyphenationCallback((word) => [word]);

export const CARD_SIZES = { "4x6": [288, 432] as [number, number], a6: "A6" as const };
export type CardSize = keyof typeof CARD_SIZES;

export function registrationUrl(code: string): string {
  return `${env.APP_URL.replace(/\/$/, "")}/r/${code}`;
}

/** The QR code image embedded on the card, as a PNG data URL (tests decode this same image). */
export function qrDataUrl(code: string): Promise<string> {
  return QRCode.toDataURL(registrationUrl(code), { errorCorrectionLevel: "M", margin: 2, width: 360, color: { dark: "#000000", light: "#ffffff" } });
}

const s = StyleSheet.create({
  page: { padding: 18, fontFamily: "Helvetica", fontSize: 7.5, color: "#1f2328", backgroundColor: "#ffffff" },
  studio: { fontSize: 8, color: "#0f5e5e", fontFamily: "Helvetica-Bold", letterSpacing: 0.5 },
  title: { fontSize: 13, fontFamily: "Helvetica-Bold", marginTop: 4 },
  sub: { fontSize: 7.5, color: "#625b50", marginTop: 2 },
  codeBox: { marginTop: 8, flexDirection: "row", alignItems: "center", borderWidth: 1, borderColor: "#e4dccf", borderRadius: 4, padding: 6 },
  qr: { width: 80, height: 80 },
  codeCol: { marginLeft: 8, flexGrow: 1, flexShrink: 1, flexBasis: 0 },
  label: { fontSize: 7, color: "#625b50", textTransform: "uppercase", letterSpacing: 0.6 },
  code: { fontFamily: "Courier-Bold", fontSize: 12.5, marginTop: 3, marginBottom: 4 },
  url: { fontSize: 6.5, color: "#625b50", flexShrink: 1 },
  h: { fontSize: 8.5, fontFamily: "Helvetica-Bold", marginTop: 8, marginBottom: 2 },
  li: { flexDirection: "row", marginBottom: 2.5 },
  bullet: { width: 8 },
  // react-pdf multiplies a unitless lineHeight by the element's own fontSize (else its 18 pt default), so set both.
  liText: { flexGrow: 1, flexShrink: 1, fontSize: 7.5, lineHeight: 1.3 },
  caution: { marginTop: 6, padding: 5, borderWidth: 1, borderColor: "#8a4b00", borderRadius: 4, backgroundColor: "#fbefdc" },
  cautionH: { fontFamily: "Helvetica-Bold", fontSize: 8, marginBottom: 2 },
  foot: { position: "absolute", bottom: 12, left: 18, right: 18, fontSize: 6, color: "#625b50" },
});

export type CardData = {
  studioName: string;
  title: string;
  subtitle: string;
  code: string;
  url: string;
  qr: string;
  basics: string[];
  cautions: string[];
  hasOil: boolean;
  schedule: string[];
  /** While the delivered finish cures: until when to go gently, and from when it takes full use. */
  curing: string | null;
};

function Bullets({ items }: { items: string[] }) {
  return (
    <View>
      {items.map((t, i) => (
        <View key={i} style={s.li} wrap={false}>
          <Text style={s.bullet}>•</Text>
          <Text style={s.liText}>{t}</Text>
        </View>
      ))}
    </View>
  );
}

export function DrawerCard({ data, size }: { data: CardData; size: CardSize }) {
  return (
    <Document title={`Drawer card — ${data.title}`} author={data.studioName} subject="Drawer card" creator="Grainward" producer="Grainward">
      <Page size={CARD_SIZES[size]} style={s.page}>
        <Text style={s.studio}>{data.studioName.toUpperCase()}</Text>
        <Text style={s.title}>{data.title}</Text>
        <Text style={s.sub}>{data.subtitle}</Text>
        <View style={s.codeBox} wrap={false}>
          {/* eslint-disable-next-line jsx-a11y/alt-text -- react-pdf Image has no alt */}
          <Image src={data.qr} style={s.qr} />
          <View style={s.codeCol}>
            <Text style={s.label}>Registration code</Text>
            <Text style={s.code}>{data.code}</Text>
            <Text style={s.url}>Scan the code, or go to {data.url.replace(/\/r\/.*$/, "/r")} and type it in, to register this piece and get its care reminders.</Text>
          </View>
        </View>
        {data.curing ? (
          <>
            <Text style={s.h}>The finish is still curing</Text>
            <Bullets items={[data.curing]} />
          </>
        ) : null}
        <Text style={s.h}>Caring for this piece</Text>
        <Bullets items={data.basics} />
        {data.schedule.length ? (
          <>
            <Text style={s.h}>Coming up</Text>
            <Bullets items={data.schedule} />
          </>
        ) : null}
        <View style={s.caution} wrap={false}>
          <Text style={s.cautionH}>{data.hasOil ? "Caution — oily rags and finishes" : "Caution"}</Text>
          {/* One paragraph: the card is small, and each caution is one short sentence. */}
          <Text style={{ fontSize: 7.5, lineHeight: 1.3 }}>{data.cautions.join(" ")}</Text>
        </View>
        <Text style={s.foot} fixed>
          Keep this card with the piece. A new owner registers with the same code.
        </Text>
      </Page>
    </Document>
  );
}

/** What the card of one of the studio's pieces says (404 for another studio's piece). */
export async function drawerCardData(ctx: StudioContext, pieceId: string, now = new Date()): Promise<CardData> {
  const piece = loadPiece(ctx, pieceId);
  const db = getDb();
  const layers = db.select().from(finishLayers).where(and(eq(finishLayers.pieceId, pieceId), eq(finishLayers.studioId, ctx.studio.id))).all();
  const careLog = db.select().from(careLogEntries).where(eq(careLogEntries.pieceId, pieceId)).all();
  const code = openRegistrationCode(piece.registrationCodeEnc);
  const { basics, cautions, hasOil } = careBasics(layers.map((l) => l.finishClass), piece.resinKind, piece.use);
  const products = studioProducts(ctx.studio.id);
  let schedule: string[] = [];
  let curing: string | null = null;
  try {
    const plan = scheduleFromRows({ piece, layers, careLog, products, timeZone: ctx.studio.timeZone, now });
    schedule = plan.tasks.slice(0, 3).map((t) => `${t.label}${t.surface === "whole_piece" ? "" : ` (${t.surface === "base" ? "base" : "top"})`}: due ${formatDate(t.dueOn)}`);
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
    qr: await qrDataUrl(code),
    basics,
    cautions,
    hasOil,
    schedule,
    curing,
  };
}

/** GET /api/pieces/[id]/card.pdf */
export async function renderDrawerCard(ctx: StudioContext, pieceId: string, size: CardSize = "4x6", now = new Date()): Promise<{ pdf: Buffer; filename: string }> {
  const data = await drawerCardData(ctx, pieceId, now);
  const pdf = await renderToBuffer(<DrawerCard data={data} size={size} />);
  const slug = data.title.toLowerCase().replace(/[^a-z0-9]+/g, "-").replace(/^-|-$/g, "").slice(0, 60) || "piece";
  return { pdf, filename: `drawer-card-${slug}${size === "a6" ? "-a6" : ""}.pdf` };
}
