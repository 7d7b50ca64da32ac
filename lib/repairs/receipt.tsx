import "server-only";
import { Document, Image, Page, StyleSheet, Text, View, renderToBuffer } from "@react-pdf/renderer";
import { conflict } from "@/lib/errors";
import { formatInstant, formatMoney } from "@/lib/format";
import { readStoredFile } from "@/lib/storage";
import { accentOf } from "@/lib/studio/brand";
import { isStudioActor, type Actor } from "@/lib/auth/actor";
import { jobFigures, type JobFigures } from "./figures";
import { getOwnerJob, getStudioJob, type JobView } from "./jobs";
import { givenBackOf, refundRows, refundsOfJob, type RefundRow } from "./refund-rows";
import { receiptPayment } from "./states";

// A repair job's receipt as a PDF, for the job's owner and the studio's staff: the studio's name,
// address and tax number, the lines, the warranty's share, tax, the total paid and the payment
// reference — the same figures the quote and the checkout carry (lib/repairs/figures).

const ink = "#1f2328";
const muted = "#625b50";
const rule = "#e4dccf";

const s = StyleSheet.create({
  page: { padding: 48, fontSize: 10, color: ink, fontFamily: "Helvetica", backgroundColor: "#fffdf9" },
  studio: { fontSize: 14, fontFamily: "Helvetica-Bold" },
  small: { fontSize: 9, color: muted, marginTop: 2 },
  title: { fontSize: 20, fontFamily: "Times-Bold", marginTop: 22, marginBottom: 10 },
  row: { flexDirection: "row", borderBottomWidth: 1, borderBottomColor: rule, paddingVertical: 5 },
  key: { width: 130, color: muted },
  val: { flex: 1 },
  line: { flexDirection: "row", borderBottomWidth: 1, borderBottomColor: rule, paddingVertical: 5 },
  desc: { flex: 1 },
  amount: { width: 110, textAlign: "right" },
  total: { flexDirection: "row", paddingVertical: 3 },
  strong: { fontFamily: "Helvetica-Bold" },
  h2: { fontSize: 12, fontFamily: "Times-Bold", marginTop: 16, marginBottom: 6 },
});

export type ReceiptData = {
  /** The studio's brand: its name in its accent (4.5:1 or more on the page, lib/studio/brand.ts) and its logo. */
  studio: { name: string; address: string; phone: string; accent: string; logoKey: string | null };
  ownerName: string;
  pieceTitle: string;
  jobTitle: string;
  paidOn: string;
  reference: string;
  /**
   * Every refund on the job (lib/repairs/refunds.ts refundRows): the studio's, with its reason; the
   * payment given back when the job was cancelled; a second payment refunded on its own. `on` names
   * the zone; null while it is still being paid back.
   */
  refunds: RefundRow[];
  /** What stays paid of this receipt's payment after its refunds; null when none of it was given back. */
  kept: string | null;
  figures: JobFigures;
  letter: boolean;
};

function Total({ label, amount, strong = false }: { label: string; amount: string; strong?: boolean }) {
  return (
    <View style={s.total}>
      <Text style={[s.desc, strong ? s.strong : {}]}>{label}</Text>
      <Text style={[s.amount, strong ? s.strong : {}]}>{amount}</Text>
    </View>
  );
}

/**
 * The PDF's built-in Helvetica has only the WinAnsi characters: Intl's minus sign (U+2212), fullwidth
 * yen (U+FFE5) and narrow no-break space (U+202F, French grouping) are written with their WinAnsi twins.
 */
const winAnsi = (text: string) => text.replace(/\u2212/g, "-").replace(/\uFFE5/g, "\u00A5").replace(/\u202F/g, "\u00A0");

function pdfFigures(f: JobFigures): JobFigures {
  return {
    ...f,
    lines: f.lines.map((l) => ({ ...l, amount: winAnsi(l.amount), quantityText: winAnsi(l.quantityText) })),
    text: { subtotal: winAnsi(f.text.subtotal), covered: f.text.covered && winAnsi(f.text.covered), discount: f.text.discount && winAnsi(f.text.discount), net: winAnsi(f.text.net), tax: winAnsi(f.text.tax), total: winAnsi(f.text.total) },
  };
}

export function ReceiptDocument({ d, logo = null }: { d: ReceiptData; logo?: Buffer | null }) {
  const f = pdfFigures(d.figures);
  return (
    <Document title={`Receipt — ${d.jobTitle}`} author={d.studio.name} subject="Receipt">
      <Page size={d.letter ? "LETTER" : "A4"} style={s.page}>
        {/* eslint-disable-next-line jsx-a11y/alt-text -- react-pdf's Image, which has no alt; the studio's name follows in text */}
        {logo ? <Image src={{ data: logo, format: "jpg" }} style={{ height: 40, objectFit: "contain", alignSelf: "flex-start", marginBottom: 6 }} /> : null}
        <Text style={[s.studio, { color: d.studio.accent }]}>{d.studio.name}</Text>
        {d.studio.address ? <Text style={s.small}>{d.studio.address}</Text> : null}
        {d.studio.phone ? <Text style={s.small}>{d.studio.phone}</Text> : null}
        {f.taxNumber ? <Text style={s.small}>Tax number: {f.taxNumber}</Text> : null}
        <Text style={s.title}>Receipt</Text>
        <View style={s.row}>
          <Text style={s.key}>Received from</Text>
          <Text style={s.val}>{d.ownerName}</Text>
        </View>
        <View style={s.row}>
          <Text style={s.key}>For</Text>
          <Text style={s.val}>
            {d.jobTitle} · {d.pieceTitle}
          </Text>
        </View>
        <View style={s.row}>
          <Text style={s.key}>Paid on</Text>
          <Text style={s.val}>{d.paidOn}</Text>
        </View>
        <View style={s.row}>
          <Text style={s.key}>Payment reference</Text>
          <Text style={s.val}>{d.reference}</Text>
        </View>
        <Text style={s.h2}>Lines</Text>
        {f.lines.map((l, i) => (
          <View key={i} style={s.line} wrap={false}>
            <View style={s.desc}>
              <Text>{l.description}</Text>
              <Text style={s.small}>{l.quantityText}</Text>
            </View>
            <Text style={s.amount}>{l.amount}</Text>
          </View>
        ))}
        <View style={{ marginTop: 8 }}>
          <Total label="Subtotal" amount={f.text.subtotal} />
          {f.text.covered ? <Total label={f.coveredLabel} amount={f.text.covered} /> : null}
          {f.text.discount ? <Total label={f.discountLabel} amount={f.text.discount} /> : null}
          <Total label="Net" amount={f.text.net} />
          <Total label={f.taxLabel} amount={f.text.tax} />
          <Total label="Total paid" amount={f.text.total} strong />
        </View>
        {d.refunds.length ? (
          <>
            <Text style={s.h2}>Refunded</Text>
            {d.refunds.map((r, i) => (
              <View key={i} style={s.line} wrap={false}>
                <View style={s.desc}>
                  <Text>{r.on ? `On ${r.on}` : "Being paid back"}</Text>
                  <Text style={s.small}>{r.why}</Text>
                </View>
                <Text style={s.amount}>{winAnsi(r.amount)}</Text>
              </View>
            ))}
            {d.kept ? <Total label="Paid after refunds" amount={winAnsi(d.kept)} strong /> : null}
          </>
        ) : null}
        {f.roundingNote ? <Text style={s.small}>{f.roundingNote}</Text> : null}
        <Text style={[s.small, { marginTop: 24, fontSize: 7 }]}>care records by Grainward</Text>
      </Page>
    </Document>
  );
}

/** The receipt's data for a job the actor reaches, with the refund of a payment given back; 409 while nothing has been paid. */
export function receiptData(actor: Actor, jobId: string): ReceiptData {
  const view: JobView = isStudioActor(actor) ? getStudioJob(actor, jobId) : getOwnerJob(actor.user, jobId);
  const payment = receiptPayment(view.payments);
  if (!payment) throw conflict("This job has no payment yet, so there is no receipt.");
  const refunds = refundsOfJob(view.job);
  const keptMinor = payment.amountMinor - givenBackOf(payment, refunds);
  // Staff read the time in the studio's zone, the owner in theirs; the zone is printed beside it.
  const tz = isStudioActor(actor) || !view.owner ? view.studio.timeZone : view.owner.timeZone;
  return {
    studio: { name: view.studio.name, address: view.studio.address, phone: view.studio.phone, accent: accentOf(view.studio.accent).hex, logoKey: view.studio.logoKey },
    ownerName: view.owner?.name ?? "—",
    pieceTitle: view.piece.title,
    jobTitle: view.job.title,
    paidOn: formatInstant(payment.paidAt ?? payment.updatedAt, tz, { time: true }),
    reference: payment.paymentIntentId ?? payment.checkoutSessionId,
    refunds: refundRows(view.payments, refunds, tz, view.studio.country),
    kept: keptMinor === payment.amountMinor ? null : formatMoney(keptMinor, payment.currency, view.studio.country),
    figures: jobFigures(view.job, view.studio),
    letter: view.studio.unitSystem === "imperial",
  };
}

export async function receiptPdf(actor: Actor, jobId: string): Promise<{ buffer: Buffer; filename: string; data: ReceiptData }> {
  const data = receiptData(actor, jobId);
  const logo = data.studio.logoKey ? await readStoredFile(data.studio.logoKey).catch(() => null) : null;
  const buffer = await renderToBuffer(<ReceiptDocument d={data} logo={logo} />);
  return { buffer, filename: `receipt-${jobId.slice(0, 8)}.pdf`, data };
}
