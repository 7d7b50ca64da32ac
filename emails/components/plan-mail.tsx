// What the mails about an owner's care plan share (plan-grace, plan-visit, plan-ended,
// plan-held-settled): the names each opens with (lib/plans/plan-mail.ts reads them), the invented
// names their previews show, and the offer of the studio's help they close with.

/** The names a plan mail opens with: to whom, from which studio, which plan on which piece. */
export type PlanMailNames = {
  ownerName: string;
  studioName: string;
  planName: string;
  pieceTitle: string;
};

/** Invented names for the React Email previews of the plan mails. */
export const PLAN_MAIL_PREVIEW_NAMES = {
  ownerName: "Jonah Reyes",
  studioName: "Larchmere Slab & Resin",
  planName: "Yearly finish keeping",
  pieceTitle: "Cherry writing desk",
} satisfies PlanMailNames;

/** The plan mails' last words: the owner can answer the mail to ask the studio for help. */
export function AskStudioForHelp({ studioName }: { studioName: string }) {
  return <>Reply to this mail if you&apos;d like {studioName} to help.</>;
}
