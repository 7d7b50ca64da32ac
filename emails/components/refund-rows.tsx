import { Column, Row, Section, Text } from "@react-email/components";
import { colors } from "./theme";

/** One refund on a job, already written out (lib/repairs/refunds.ts refundRows): amount, when with its zone (null: still being paid back), why. */
export type RefundRowText = { amount: string; on: string | null; why: string };

const cell = { fontSize: "15px", lineHeight: "22px", color: colors.ink, margin: "0" } as const;
const small = { fontSize: "13px", lineHeight: "18px", color: colors.muted, margin: "0" } as const;

/** Every refund on the job, each with its amount, date and time, and reason. */
export function RefundRows({ refunds }: { refunds: RefundRowText[] }) {
  if (refunds.length === 0) return null;
  return (
    <Section style={{ margin: "0 0 16px" }}>
      <Text style={{ ...cell, fontWeight: 700, margin: "0 0 4px" }}>Refunded</Text>
      {refunds.map((r, i) => (
        <Row key={i} style={{ borderBottom: `1px solid ${colors.rule}`, padding: "6px 0" }}>
          <Column>
            <Text style={cell}>{r.on ? `On ${r.on}` : "Being paid back"}</Text>
            <Text style={small}>{r.why}</Text>
          </Column>
          <Column align="right" style={{ verticalAlign: "top" }}>
            <Text style={cell}>{r.amount}</Text>
          </Column>
        </Row>
      ))}
    </Section>
  );
}
