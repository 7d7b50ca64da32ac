import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { memberships, users, type Claim, type Piece, type Studio } from "@/db/schema";
import { ClaimDecisionEmail, claimDecisionSubject } from "@/emails/claim-decision";
import { ClaimMessageEmail, claimMessageSubject } from "@/emails/claim-message";
import { ClaimReceivedEmail, claimReceivedSubject } from "@/emails/claim-received";
import { env } from "@/lib/env";
import { formatDate } from "@/lib/format";
import { sendMail, type SendMailInput } from "@/lib/mail";
import { replyToFor } from "@/lib/messages/store";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import { CLAIM_CATEGORY_LABELS } from "./labels";

// Claim mail is transactional: it goes to the owner whatever their reminder preferences are.

type Person = { name: string; email: string };

const ownerUrl = (claimId: string) => new URL(`/claims/${claimId}`, env.APP_URL).toString();
const staffUrl = (claimId: string) => new URL(`/studio/claims/${claimId}`, env.APP_URL).toString();

/** The studio's side of claim mail: its own address, or its admins when it has none. */
export function studioRecipients(studio: Pick<Studio, "id" | "email">): string[] {
  if (studio.email.trim()) return [studio.email.trim()];
  return getDb()
    .select({ email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.studioId, studio.id), eq(memberships.role, "admin")))
    .all()
    .map((r) => r.email);
}

/** Sent after the claim change is committed (lib/mail/after-commit.ts); no recipients, no mail. */
async function send(input: SendMailInput): Promise<void> {
  const to = Array.isArray(input.to) ? input.to : [input.to];
  if (to.length === 0) return;
  await mailAfterCommit(`claim mail "${input.subject}" to ${to.join(", ")}`, () => sendMail(input));
}

/** The owner's answer by e-mail lands in the claim's conversation (lib/messages, lib/mail/inbound.ts). */
const threadReplyTo = (claim: Claim) => replyToFor(getDb(), { kind: "claim", id: claim.id });

export async function mailClaimReceived({ claim, piece, studio, owner }: { claim: Claim; piece: Piece; studio: Studio; owner: Person }) {
  const common = {
    ownerName: owner.name,
    studioName: studio.name,
    pieceTitle: piece.title,
    categoryLabel: CLAIM_CATEGORY_LABELS[claim.category],
    noticedOn: formatDate(claim.noticedOn),
    description: claim.description,
  };
  await send({
    studioId: claim.studioId,
    to: owner.email,
    replyTo: threadReplyTo(claim),
    subject: claimReceivedSubject({ audience: "owner", ...common }),
    email: <ClaimReceivedEmail audience="owner" url={ownerUrl(claim.id)} {...common} />,
  });
  await send({
    studioId: claim.studioId,
    to: studioRecipients(studio),
    replyTo: owner.email,
    subject: claimReceivedSubject({ audience: "studio", ...common }),
    email: <ClaimReceivedEmail audience="studio" url={staffUrl(claim.id)} {...common} />,
  });
}

export async function mailClaimMessage(p: { claim: Claim; piece: Piece; studio: Studio; owner: Person; fromStudio: boolean; authorName: string; body: string; requestInfo: boolean }) {
  const audience = p.fromStudio ? "owner" : "studio";
  const props = { audience, authorName: p.authorName, studioName: p.studio.name, pieceTitle: p.piece.title, body: p.body, requestInfo: p.requestInfo } as const;
  await send({
    studioId: p.claim.studioId,
    to: p.fromStudio ? p.owner.email : studioRecipients(p.studio),
    replyTo: p.fromStudio ? threadReplyTo(p.claim) : p.owner.email,
    subject: claimMessageSubject(props),
    email: <ClaimMessageEmail {...props} url={p.fromStudio ? ownerUrl(p.claim.id) : staffUrl(p.claim.id)} />,
  });
}

export async function mailClaimDecision({ claim, piece, studio, owner }: { claim: Claim; piece: Piece; studio: Studio; owner: Person }) {
  if (!claim.decision) return;
  await send({
    studioId: claim.studioId,
    to: owner.email,
    replyTo: threadReplyTo(claim),
    subject: claimDecisionSubject({ studioName: studio.name, pieceTitle: piece.title }),
    email: (
      <ClaimDecisionEmail
        ownerName={owner.name}
        studioName={studio.name}
        pieceTitle={piece.title}
        decision={claim.decision}
        coveredPct={claim.coveredPct}
        reason={claim.decisionReason}
        url={ownerUrl(claim.id)}
      />
    ),
  });
}
