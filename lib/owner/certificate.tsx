import "server-only";
import { Document, Page, StyleSheet, Text, View, renderToBuffer } from "@react-pdf/renderer";
import { eq } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { pieces, studios } from "@/db/schema";
import { pdfBrandOf, PdfBrandHeader, type PdfBrand } from "@/lib/pieces/card-brand";
import { CARE_RECORDS_BY } from "@/lib/pieces/card-words";
import { formatDate, formatInstant, formatTimeLeft } from "@/lib/format";
import { getMyPiece, type PieceDetail } from "./pieces";
import { exclusionLabel, WARRANTY_STATUS_LABELS } from "./warranty";

// The warranty certificate of one piece, for its current owner: what the piece is, who made it,
// when it was delivered and registered, and each warranty line with its term and time left.

const ink = "#1f2328";
const muted = "#625b50";
const line = "#e4dccf";

const s = StyleSheet.create({
  page: { padding: 48, fontSize: 10, color: ink, fontFamily: "Helvetica", backgroundColor: "#fffdf9" },
  brand: { marginBottom: 18 },
  title: { fontSize: 22, fontFamily: "Times-Bold", marginBottom: 4 },
  lead: { fontSize: 11, color: muted, marginBottom: 18 },
  h2: { fontSize: 13, fontFamily: "Times-Bold", marginTop: 16, marginBottom: 6 },
  row: { flexDirection: "row", borderBottomWidth: 1, borderBottomColor: line, paddingVertical: 5 },
  key: { width: 130, color: muted },
  val: { flex: 1 },
  lineBox: { borderWidth: 1, borderColor: line, borderRadius: 4, padding: 8, marginBottom: 6 },
  lineTitle: { fontFamily: "Helvetica-Bold", marginBottom: 2 },
  small: { fontSize: 8.5, color: muted, marginTop: 2 },
  foot: { position: "absolute", bottom: 32, left: 48, right: 48, fontSize: 8, color: muted },
});

function Row({ k, v }: { k: string; v: string }) {
  return (
    <View style={s.row}>
      <Text style={s.key}>{k}</Text>
      <Text style={s.val}>{v}</Text>
    </View>
  );
}

export function CertificateDocument({ piece, ownerName, issuedAt, brand }: { piece: PieceDetail; ownerName: string; issuedAt: Date; brand: PdfBrand }) {
  return (
    <Document title={`Warranty certificate — ${piece.title}`} author={brand.name} subject="Warranty certificate" creator="Grainward" producer="Grainward">
      {/* Paper follows the owner's units: US Letter for imperial (US and Canadian readers), A4 otherwise. */}
      <Page size={piece.units === "imperial" ? "LETTER" : "A4"} style={s.page}>
        {/* The studio's brand; Grainward's own name stays small, under it. */}
        <View style={s.brand}>
          <PdfBrandHeader brand={brand} fontSize={12} logoHeight={28} />
          <Text style={{ fontSize: 7.5, color: muted, marginTop: 2 }}>{CARE_RECORDS_BY}</Text>
        </View>
        <Text style={s.title}>Warranty certificate</Text>
        <Text style={s.lead}>
          {piece.title} · made by {piece.studio.name}
        </Text>
        <Row k="Piece" v={`${piece.kindLabel}: ${piece.title}`} />
        <Row k="Wood" v={piece.species.secondary ? `${piece.species.primary} with ${piece.species.secondary}` : piece.species.primary} />
        <Row k="Size" v={piece.size} />
        <Row k="Made and delivered by" v={piece.studio.name} />
        <Row k="Delivered on" v={formatDate(piece.deliveredOn)} />
        <Row k="Registered to" v={ownerName} />
        <Row k="Registered on" v={piece.registeredAt ? formatInstant(piece.registeredAt, piece.timeZone) : "—"} />
        <Row k="Terms" v={piece.warranty.termsName ?? "None recorded"} />
        <Row k="Studio record number" v={piece.id} />

        <Text style={s.h2}>Warranty lines</Text>
        {piece.warranty.lines.length === 0 ? <Text>No warranty terms were recorded for this piece. Ask {piece.studio.name}.</Text> : null}
        {piece.warranty.lines.map((l) => (
          <View key={l.category} style={s.lineBox} wrap={false}>
            <Text style={s.lineTitle}>{l.label}</Text>
            <Text>
              {WARRANTY_STATUS_LABELS[l.status]} · {l.termMonths} months from delivery, until {formatDate(l.endsOn)}
              {l.status === "active" ? ` · ${formatTimeLeft(l.daysLeft)} left` : ""}
            </Text>
            <Text style={s.small}>
              {l.transfersToNewOwner ? "Passes to a new owner if the piece changes hands." : "Stays with the first owner; it ends if the piece changes hands."}
              {l.exclusions.length ? ` Not covered: ${l.exclusions.map((e) => exclusionLabel(e)).join(", ")}.` : ""}
              {l.careLogRequired ? " Keep the care log up to date: this line expects care to be done when it falls due." : ""}
            </Text>
          </View>
        ))}
        <Text style={s.foot} fixed>
          Issued by Grainward on {formatInstant(issuedAt, piece.timeZone, { time: true })} for the piece&apos;s registered owner. The studio&apos;s warranty
          terms decide every claim; this certificate summarises them as they stood on that day.
        </Text>
      </Page>
    </Document>
  );
}

/** The certificate PDF of a piece `owner` holds (else 404). */
export async function certificatePdf(owner: Pick<User, "id" | "name" | "timeZone" | "unitSystem">, pieceId: string, now = new Date()) {
  const piece = getMyPiece(owner, pieceId, now);
  const studio = getDb().select({ name: studios.name, logoKey: studios.logoKey, accent: studios.accent }).from(pieces).innerJoin(studios, eq(studios.id, pieces.studioId)).where(eq(pieces.id, piece.id)).get()!;
  const buffer = await renderToBuffer(<CertificateDocument piece={piece} ownerName={owner.name} issuedAt={now} brand={await pdfBrandOf(studio)} />);
  const slug = piece.title.toLowerCase().replace(/[^a-z0-9]+/g, "-").replace(/^-|-$/g, "").slice(0, 60) || "piece";
  return { buffer, filename: `warranty-certificate-${slug}.pdf` };
}
