import { Section, Text } from "@react-email/components";
import { ActionClose, SpelledLink } from "./components/button";
import { CareFooter } from "./components/care-footer";
import { EmailLayout, Note, Paragraph } from "./components/layout";
import { colors } from "./components/theme";
import { RefreshOfferSection, type RefreshOfferProps } from "./refresh-offer";

export type CareReminderStep = "before_14d" | "due_day" | "after_30d";

export type CareReminderProps = {
  ownerName: string;
  studioName: string;
  pieceTitle: string;
  step: CareReminderStep;
  /** e.g. "Re-oil coming due on 2 May 2026" */
  headline: string;
  /** The opening sentence, e.g. "Your … is due for care in 14 days, on 2 May 2026: re-oil (top)." */
  lead: string;
  taskLabel: string;
  /** "top", "base" or "whole piece" */
  surface: string;
  /** e.g. "2 May 2026" */
  dueOn: string;
  whyNow: string[];
  steps: string[];
  quantity?: string;
  cautions: string[];
  pieceUrl: string;
  logUrl: string;
  preferencesUrl: string;
  unsubscribeUrl: string;
  offer?: Omit<RefreshOfferProps, "studioName" | "taskLabel">;
};

export function CareReminder(p: CareReminderProps) {
  return (
    <EmailLayout
      preview={`${p.headline} — ${p.pieceTitle}${p.offer ? ", with a refresh visit offer" : ""}`}
      heading={p.headline}
      footer={<CareFooter studioName={p.studioName} preferencesUrl={p.preferencesUrl} unsubscribeUrl={p.unsubscribeUrl} />}
    >
      <Paragraph>Hi {p.ownerName},</Paragraph>
      <Paragraph>{p.lead}</Paragraph>
      <Text style={{ fontSize: "15px", fontWeight: 600, color: colors.ink, margin: "0 0 6px" }}>Why now</Text>
      {p.whyNow.map((w) => (
        <Note key={w}>{w}</Note>
      ))}
      <Text style={{ fontSize: "15px", fontWeight: 600, color: colors.ink, margin: "16px 0 6px" }}>What to do</Text>
      {p.steps.map((s, i) => (
        <Text key={s} style={{ fontSize: "15px", lineHeight: "24px", color: colors.ink, margin: "0 0 6px" }}>
          {i + 1}. {s}
        </Text>
      ))}
      {p.quantity ? (
        <Text style={{ fontSize: "15px", lineHeight: "24px", color: colors.ink, margin: "12px 0 0" }}>How much: {p.quantity}</Text>
      ) : null}
      {p.cautions.length > 0 ? (
        <Section style={{ backgroundColor: "#fbefdc", border: "1px solid #e8cfa4", borderRadius: "6px", padding: "12px 16px", margin: "20px 0" }}>
          <Text style={{ fontSize: "15px", fontWeight: 600, color: colors.ink, margin: "0 0 6px" }}>Caution</Text>
          {p.cautions.map((c) => (
            <Text key={c} style={{ fontSize: "14px", lineHeight: "22px", color: colors.ink, margin: "0 0 6px" }}>
              {c}
            </Text>
          ))}
        </Section>
      ) : null}
      <Paragraph>Done it? Log it, and the next reminder moves to the right date.</Paragraph>
      <ActionClose href={p.logUrl} label="Log it as done" />
      <Note>
        The care record of your piece: <SpelledLink href={p.pieceUrl} />
      </Note>
      {p.offer ? <RefreshOfferSection studioName={p.studioName} taskLabel={p.taskLabel} {...p.offer} /> : null}
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
CareReminder.PreviewProps = {
  ownerName: "Jonah Reyes",
  studioName: "Larchmere Slab & Resin (invented)",
  pieceTitle: "Walnut river dining table",
  step: "before_14d",
  headline: "Re-oil coming due on 2 May 2026",
  lead: "Your Walnut river dining table is due for care in 14 days, on 2 May 2026: re-oil (top).",
  taskLabel: "Re-oil",
  surface: "top",
  dueOn: "2 May 2026",
  whyNow: ["The last oil coat on the top went on 2 May 2025.", "For heavy use, in indirect sun, this finish lasts about 12 months, so it is due on 2 May 2026."],
  steps: ["Clean the surface with a little mild soap in water and let it dry completely."],
  // As lib/owner/format writes it for an imperial reader: 105 mL = 3.55 fl oz → 3.6; 125 mL = 4.23 fl oz → 4.3.
  quantity: "About 3.6 US fl oz (105 mL) of Studio hardwax oil, satin for one coat on this top (26.8 ft²) — 1 × 4.3 US fl oz (125 mL) is enough.",
  cautions: ["Oily rags can heat up and catch fire by themselves within hours."],
  pieceUrl: "https://grainward.example/pieces/example",
  logUrl: "https://grainward.example/pieces/example/log?task=example",
  preferencesUrl: "https://grainward.example/unsubscribe?t=example",
  unsubscribeUrl: "https://grainward.example/api/unsubscribe?t=example",
} satisfies CareReminderProps;

export default CareReminder;
