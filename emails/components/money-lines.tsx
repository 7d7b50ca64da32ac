import { Column, Row, Section, Text } from "@react-email/components";
import { colors } from "./theme";

/** A quote's or receipt's lines and totals, already written out (lib/repairs/figures). */
export type MoneyLinesProps = {
  lines: { description: string; detail: string; amount: string }[];
  subtotal: string;
  covered: { label: string; amount: string } | null;
  /** A running care plan's discount on the repair; absent or null: none. */
  discount?: { label: string; amount: string } | null;
  net: string;
  taxLabel: string;
  tax: string;
  total: string;
  totalLabel: string;
  roundingNote: string | null;
  taxNumber: string | null;
};

const cell = { fontSize: "15px", lineHeight: "22px", color: colors.ink, margin: "0" } as const;
const small = { fontSize: "13px", lineHeight: "18px", color: colors.muted, margin: "0" } as const;

function Pair({ label, amount, strong = false }: { label: string; amount: string; strong?: boolean }) {
  return (
    <Row style={{ padding: "4px 0" }}>
      <Column>
        <Text style={{ ...cell, fontWeight: strong ? 700 : 400 }}>{label}</Text>
      </Column>
      <Column align="right">
        <Text style={{ ...cell, fontWeight: strong ? 700 : 400 }}>{amount}</Text>
      </Column>
    </Row>
  );
}

export function MoneyLines({ lines, subtotal, covered, discount, net, taxLabel, tax, total, totalLabel, roundingNote, taxNumber }: MoneyLinesProps) {
  return (
    <Section style={{ margin: "0 0 16px" }}>
      {lines.map((l, i) => (
        <Row key={i} style={{ borderBottom: `1px solid ${colors.rule}`, padding: "6px 0" }}>
          <Column>
            <Text style={cell}>{l.description}</Text>
            <Text style={small}>{l.detail}</Text>
          </Column>
          <Column align="right" style={{ verticalAlign: "top" }}>
            <Text style={cell}>{l.amount}</Text>
          </Column>
        </Row>
      ))}
      <Pair label="Subtotal" amount={subtotal} />
      {covered ? <Pair label={covered.label} amount={covered.amount} /> : null}
      {discount ? <Pair label={discount.label} amount={discount.amount} /> : null}
      <Pair label="Net" amount={net} />
      <Pair label={taxLabel} amount={tax} />
      <Pair label={totalLabel} amount={total} strong />
      {roundingNote ? <Text style={small}>{roundingNote}</Text> : null}
      {taxNumber ? <Text style={small}>Tax number: {taxNumber}</Text> : null}
    </Section>
  );
}
