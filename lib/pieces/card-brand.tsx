import { Image, Text, View } from "@react-pdf/renderer";
import sharp from "sharp";
import { accentOf } from "@/lib/studio/brand";
import { readStoredFile } from "@/lib/storage";

// The studio's brand at the top of its printed PDFs (drawer cards, warranty certificate): its logo when
// it has one (studios.logoKey, read through lib/storage) and its name in its accent colour. The logo is
// read and re-encoded once per storage key per process (a new upload gets a new key): a small JPEG on
// white, which a PDF embeds as it is, so printing a hundred cards decodes the logo once.

export type PdfBrand = { name: string; accent: string; logo: Buffer | null };

const LOGO_CACHE_MAX = 64;
const logos = new Map<string, Promise<Buffer | null>>();

function printableLogo(key: string): Promise<Buffer | null> {
  const hit = logos.get(key);
  if (hit) return hit;
  const made = readStoredFile(key)
    .then((raw) => sharp(raw, { limitInputPixels: 25_000_000 }).resize({ width: 480, height: 160, fit: "inside", withoutEnlargement: true }).flatten({ background: "#ffffff" }).jpeg({ quality: 88 }).toBuffer())
    // A missing or unreadable logo prints the name alone rather than failing the card.
    .catch(() => null);
  if (logos.size >= LOGO_CACHE_MAX) logos.delete(logos.keys().next().value!);
  logos.set(key, made);
  return made;
}

export async function pdfBrandOf(studio: { name: string; logoKey: string | null; accent: string }): Promise<PdfBrand> {
  return { name: studio.name, accent: accentOf(studio.accent).hex, logo: studio.logoKey ? await printableLogo(studio.logoKey) : null };
}

/** Logo (if any) beside the studio's name on one line; the name is cut with an ellipsis when long. */
export function PdfBrandHeader({ brand, fontSize, logoHeight }: { brand: PdfBrand; fontSize: number; logoHeight: number }) {
  return (
    <View style={{ flexDirection: "row", alignItems: "center", height: Math.max(logoHeight, fontSize * 1.3) }}>
      {brand.logo ? (
        // eslint-disable-next-line jsx-a11y/alt-text -- react-pdf Image has no alt
        <Image src={{ data: brand.logo, format: "jpg" }} style={{ height: logoHeight, maxWidth: logoHeight * 4, objectFit: "contain", marginRight: 6 }} />
      ) : null}
      <Text style={{ fontFamily: "Helvetica-Bold", fontSize, color: brand.accent, letterSpacing: 0.4, flexGrow: 1, flexShrink: 1, maxLines: 1, textOverflow: "ellipsis" }}>
        {brand.name}
      </Text>
    </View>
  );
}
