// Started once when the server starts (instrumentation.ts), so the first drawer card a studio prints
// doesn't pay for starting the PDF renderer. @react-pdf/renderer stays outside Next's server bundle (one
// of Next's default server external packages), so the module instance warmed here is the one the card
// routes use. The page rendered here has the card's shape (lib/pieces/card.tsx) with invented words:
// the standard fonts it sets in, a two-line title cut with an ellipsis, bullets that wrap in flex rows,
// boxes with borders, a painted square grid as the QR code (and one QR code encoded), a vector path as cut marks and a fixed
// footer, at two type sizes as the card's fitting tries them. Nothing here touches the database, and
// it never throws.
import type { ReactElement } from "react";

const WORDS = "Wipe spills at once with a damp cloth and dry the surface; keep it out of strong sun and away from heaters, and use mats under hot dishes.";

export async function warmCardRenderer(): Promise<number> {
  const started = performance.now();
  try {
    const { Canvas, Document, Page, Path, Svg, Text, View, renderToBuffer } = await import("@react-pdf/renderer");
    const page = (font: number): ReactElement => (
      <Page size={[288, 432]} style={{ paddingTop: 16, paddingHorizontal: 16, paddingBottom: 46, fontFamily: "Helvetica" }}>
        <Text style={{ fontFamily: "Helvetica-Bold", fontSize: 8, maxLines: 1, textOverflow: "ellipsis" }}>Warm-up Workshop (invented)</Text>
        <Text style={{ fontSize: 12.5, lineHeight: 1.15, fontFamily: "Helvetica-Bold", height: 29, maxLines: 2, textOverflow: "ellipsis" }}>{WORDS}</Text>
        <View style={{ flexDirection: "row", alignItems: "center", borderWidth: 1, borderColor: "#e4dccf", borderRadius: 4, padding: 5 }} wrap={false}>
          <Canvas
            style={{ width: 76, height: 76 }}
            paint={(p) => {
              for (let r = 0; r < 29; r++) for (let c = r % 2; c < 29; c += 2) p.rect(c * 2.6, r * 2.6, 2.6, 2.6);
              p.fill("#000000");
              return null;
            }}
          />
          <View style={{ marginLeft: 7, flexGrow: 1, flexShrink: 1, flexBasis: 0 }}>
            <Text style={{ fontFamily: "Courier-Bold", fontSize: 12 }}>WARM-UP-00</Text>
            <Text style={{ fontFamily: "Courier", fontSize: 6.5 }}>{"localhost/\nregister"}</Text>
          </View>
        </View>
        {[0, 1, 2, 3, 4].map((i) => (
          <View key={i} style={{ flexDirection: "row", marginBottom: 2 }} wrap={false}>
            <Text style={{ width: 7, fontSize: font }}>•</Text>
            <Text style={{ flexGrow: 1, flexShrink: 1, flexBasis: 0, fontSize: font, lineHeight: 1.28 }}>{WORDS}</Text>
          </View>
        ))}
        <Svg style={{ width: 20, height: 20 }} viewBox="0 0 20 20">
          <Path d="M0 10H20M10 0V20" stroke="#777777" strokeWidth={0.5} />
        </Svg>
        <View style={{ position: "absolute", bottom: 10, left: 16, right: 16, fontSize: 5.8 }} fixed>
          <Text>{WORDS}</Text>
        </View>
      </Page>
    );
    for (const font of [7.5, 6.6]) await renderToBuffer(<Document>{page(font)}</Document>);
    // The QR encoder is kept outside the bundle too (next.config.mjs), so its first code is made here.
    const QRCode = (await import("qrcode")).default;
    QRCode.create("http://localhost/r/WARM-UP-00", { errorCorrectionLevel: "M" });
  } catch {
    // A warm-up that fails leaves the first card to start the renderer itself, as before.
  }
  return performance.now() - started;
}
