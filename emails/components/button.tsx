import type { ReactNode } from "react";
import { Button as EmailButton, Link, Section } from "@react-email/components";
import { Note } from "./layout";
import { accentColor, colors } from "./theme";

/** The one call to action of a message: a large button in the accent colour. */
function ActionButton({ href, children }: { href: string; children: string }) {
  return (
    <Section style={{ margin: "8px 0 24px" }}>
      <EmailButton
        href={href}
        style={{
          backgroundColor: accentColor(),
          color: colors.onAccent,
          borderRadius: "6px",
          fontSize: "16px",
          fontWeight: 600,
          textDecoration: "none",
          padding: "14px 24px",
          display: "inline-block",
        }}
      >
        {children}
      </EmailButton>
    </Section>
  );
}

/**
 * An address written out in the text. It may break anywhere: as one long word it would push the
 * message past a phone's edge (tests/integration/email-narrow.test.ts).
 */
export function SpelledLink({ href }: { href: string }) {
  return (
    <Link href={href} style={{ color: accentColor(), wordBreak: "break-all" }}>
      {href}
    </Link>
  );
}

/** The same link spelled out, for clients that hide buttons and for the plain-text part. */
function LinkFallback({ href }: { href: string }) {
  return (
    <Note>
      If the button does not work, copy this link into your browser: <SpelledLink href={href} />
    </Note>
  );
}

/** The close of a message: its one action, the link spelled out below it, and a last note when there is one. */
export function ActionClose({ href, label, note }: { href: string; label: string; note?: ReactNode }) {
  return (
    <>
      <ActionButton href={href}>{label}</ActionButton>
      <LinkFallback href={href} />
      {note ? <Note>{note}</Note> : null}
    </>
  );
}
