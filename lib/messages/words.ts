// What conversations are called on the studio's pages. Pure: pages and components both use it.
export const ABOUT_LABELS = { claim: "Claim", job: "Repair job", visit: "Visit" } as const;

export const THREAD_STATE_WORDS = { unread: "Unread", open: "Open", done: "Done" } as const;

export const UNMATCHED_WORDS = {
  no_token: "Sent to an address that belongs to no conversation.",
  bad_token: "The reply address was changed or damaged, so it can't be tied to its conversation safely.",
  wrong_sender: "Sent from an address other than the owner's; check who wrote before answering.",
  closed: "The conversation can't take replies any more (the claim is closed or the piece has a new owner).",
  empty: "The reply had nothing of its own once the quoted mail was taken out.",
} as const;
