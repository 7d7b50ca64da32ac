import { DrizzleSQLiteAdapter } from "@lucia-auth/adapter-drizzle";
import { Lucia, TimeSpan } from "lucia";
import { getDb } from "@/db/client";
import { sessions, users } from "@/db/schema";
import { env } from "@/lib/env";

export const SESSION_COOKIE = "gw_session";

let instance: ReturnType<typeof createLucia> | undefined;

function createLucia() {
  return new Lucia(new DrizzleSQLiteAdapter(getDb(), sessions, users), {
    sessionExpiresIn: new TimeSpan(30, "d"),
    sessionCookie: {
      name: SESSION_COOKIE,
      expires: true,
      // Secure whenever the app is served over https; http://localhost demos keep working.
      attributes: { secure: env.APP_URL.startsWith("https://"), sameSite: "lax" },
    },
    getUserAttributes: (row) => ({
      email: row.email,
      name: row.name,
      emailVerifiedAt: row.emailVerifiedAt,
      timeZone: row.timeZone,
      unitSystem: row.unitSystem,
      remindersEnabled: row.remindersEnabled,
    }),
  });
}

/** Opened lazily so that importing a module never opens the database (Next.js imports at build time). */
export function getLucia() {
  return (instance ??= createLucia());
}

declare module "lucia" {
  interface Register {
    Lucia: ReturnType<typeof createLucia>;
    DatabaseUserAttributes: {
      email: string;
      name: string;
      emailVerifiedAt: Date | number | null;
      timeZone: string;
      unitSystem: "metric" | "imperial";
      remindersEnabled: boolean;
    };
  }
}
