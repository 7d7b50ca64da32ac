// Prints an invite link for starting one studio, for installs with STUDIO_SIGNUP=invite:
//   npx tsx scripts/studio-invite.ts [days]     (default 14 days)
// The link is signed with APP_SECRET and APP_URL is its address, so run it with the app's settings.
import { env } from "@/lib/env";
import { studioInviteLink, studioInviteToken } from "@/lib/studio/create-invite";

const days = Number(process.argv[2] ?? 14);
if (!Number.isInteger(days) || days < 1 || days > 90) {
  console.error("Give the number of days the link stays valid, from 1 to 90 (default 14).");
  process.exit(2);
}
const token = studioInviteToken({ days });
console.log(studioInviteLink(token));
console.error(
  `Starts one studio; valid for ${days} day${days === 1 ? "" : "s"}.${env.STUDIO_SIGNUP === "invite" ? "" : ` Note: STUDIO_SIGNUP is "${env.STUDIO_SIGNUP}" here; the link is only asked for when it is "invite".`}`,
);
