import type { ReactNode } from "react";
import { Body, Container, Head, Heading, Hr, Html, Img, Preview, Section, Text } from "@react-email/components";
import { emailBrand } from "./brand";
import { accentColor, colors, fontStack, serifStack } from "./theme";

export type EmailLayoutProps = {
  /** The one line mail clients show next to the subject. */
  preview: string;
  heading: string;
  children: ReactNode;
  /** Replaces the default footer line (e.g. why this owner gets care mail, with a preferences link). */
  footer?: ReactNode;
};

/** The top of the message: the studio's logo and name in its accent when sent for a studio, else Grainward's name. */
function Masthead() {
  const brand = emailBrand();
  const nameStyle = { fontFamily: serifStack, fontSize: "20px", letterSpacing: "0.02em", color: accentColor(), margin: "0 0 24px" } as const;
  if (!brand) return <Text style={nameStyle}>Grainward</Text>;
  return (
    <Section style={{ margin: "0 0 24px" }}>
      {brand.logoUrl ? <Img src={brand.logoUrl} alt="" height="48" style={{ height: "48px", width: "auto", margin: "0 0 8px" }} /> : null}
      <Text style={{ ...nameStyle, margin: 0 }}>{brand.name}</Text>
    </Section>
  );
}

export function EmailLayout({ preview, heading, children, footer }: EmailLayoutProps) {
  const brand = emailBrand();
  return (
    <Html lang="en">
      <Head />
      <Preview>{preview}</Preview>
      <Body style={{ backgroundColor: colors.paper, color: colors.ink, fontFamily: fontStack, margin: 0, padding: "32px 0" }}>
        <Container style={{ maxWidth: "560px", margin: "0 auto", padding: "0 20px" }}>
          <Masthead />
          <Section
            style={{
              backgroundColor: colors.card,
              border: `1px solid ${colors.rule}`,
              borderRadius: "8px",
              padding: "32px 28px",
            }}
          >
            <Heading
              as="h1"
              style={{ fontFamily: serifStack, fontSize: "24px", lineHeight: "32px", fontWeight: 600, color: colors.ink, margin: "0 0 20px" }}
            >
              {heading}
            </Heading>
            {children}
          </Section>
          <Hr style={{ borderColor: colors.rule, margin: "32px 0 16px" }} />
          <Text style={{ fontSize: "13px", lineHeight: "20px", color: colors.muted, margin: 0 }}>
            {footer ?? "Grainward keeps the care record of pieces made by hand, so they last as long as they were built to."}
          </Text>
          {brand ? <Text style={{ fontSize: "12px", lineHeight: "18px", color: colors.muted, margin: "8px 0 0" }}>{brand.name} · care records by Grainward</Text> : null}
        </Container>
      </Body>
    </Html>
  );
}

/** A body paragraph in the house style. */
export function Paragraph({ children }: { children: ReactNode }) {
  return <Text style={{ fontSize: "16px", lineHeight: "26px", color: colors.ink, margin: "0 0 16px" }}>{children}</Text>;
}

/** A quieter paragraph: fallbacks, "you can ignore this", small print. */
export function Note({ children }: { children: ReactNode }) {
  return <Text style={{ fontSize: "14px", lineHeight: "22px", color: colors.muted, margin: "0 0 12px" }}>{children}</Text>;
}

export default EmailLayout;
