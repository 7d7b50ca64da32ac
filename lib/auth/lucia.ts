import { DrizzleSQLiteAdapter } from "@lucia-auth/adapter-drizzle";
import { eq, sql } from "drizzle-orm";
import { Lucia, TimeSpan, type DatabaseSession, type DatabaseUser } from "lucia";
import { bound } from "@/db/bound";
import { getDb, type Db } from "@/db/client";
import { sessions, users } from "@/db/schema";
import { env } from "@/lib/env";

export const SESSION_COOKIE = "gw_session";

let instance: ReturnType<typeof createLucia> | undefined;

/**
 * The package's adapter, except that the lookup every signed-in request makes is one prepared join
 * instead of two queries built afresh each time (that building cost more than the reads). The id is
 * bound as `+?` (db/bound.ts): by the sessions' primary key, one row whatever the id, planned once.
 */
class SessionAdapter extends DrizzleSQLiteAdapter {
  private readonly lookup;
  constructor(db: Db) {
    super(db, sessions, users);
    this.lookup = db.select({ session: sessions, user: users }).from(sessions).innerJoin(users, eq(users.id, sessions.userId)).where(eq(sessions.id, bound(sql.placeholder("id")))).prepare();
  }
  override async getSessionAndUser(sessionId: string): Promise<[DatabaseSession | null, DatabaseUser | null]> {
    const row = this.lookup.get({ id: sessionId });
    if (!row) return [null, null];
    const { id, userId, expiresAt, ...sessionAttributes } = row.session;
    const { id: uid, ...userAttributes } = row.user;
    return [
      { id, userId, expiresAt: new Date(expiresAt * 1000), attributes: sessionAttributes },
      { id: uid, attributes: userAttributes as unknown as DatabaseUser["attributes"] },
    ];
  }
}

function createLucia() {
  return new Lucia(new SessionAdapter(getDb()), {
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
