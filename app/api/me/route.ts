import { studioMemberships } from "@/lib/auth/actor";
import { route } from "@/lib/http/route";

export const GET = route({ roles: ["owner"] }, async ({ actor: { user } }) => {
  const studios = (await studioMemberships(user.id)).map((m) => ({ id: m.studio.id, name: m.studio.name, role: m.role }));
  return { user: { id: user.id, email: user.email, name: user.name, emailVerified: Boolean(user.emailVerifiedAt) }, studios };
});
