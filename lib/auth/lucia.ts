import { DrizzleMySQLAdapter } from "@lucia-auth/adapter-drizzle";
import { eq, sql } from "drizzle-orm";
import { Lucia, TimeSpan, type DatabaseSession, type DatabaseUser } from "lucia";
import { getDb, type Database } from "@/db/client";
import { sessions, users } from "@/db/schema";
import type { Role } from "@/db/schema/users";
import { getEnv } from "@/lib/env";

// lucia v3 is frozen upstream: nothing outside lib/auth imports it, so it can be replaced here alone.

/** The user row as drizzle maps it (camelCase keys); the adapter passes it through. */
interface DatabaseUserAttributes {
  email: string;
  name: string;
  role: Role;
  programId: number | null;
  status: "active" | "invited" | "suspended" | "disabled";
  companyId: number | null;
  isBillingManager: boolean;
}

/**
 * The adapter, with the one look-up every signed-in request makes (session and user by the
 * session id) as a prepared statement that reads only the columns the app uses: no password
 * hash, and the SQL built once rather than per request.
 */
class SessionAdapter extends DrizzleMySQLAdapter {
  private readonly sessionAndUser;

  constructor(db: Database) {
    super(db, sessions, users);
    this.sessionAndUser = db
      .select({
        id: sessions.id,
        userId: sessions.userId,
        expiresAt: sessions.expiresAt,
        email: users.email,
        name: users.name,
        role: users.role,
        programId: users.programId,
        status: users.status,
        companyId: users.companyId,
        isBillingManager: users.isBillingManager,
      })
      .from(sessions)
      .innerJoin(users, eq(sessions.userId, users.id))
      .where(eq(sessions.id, sql.placeholder("sessionId")))
      .limit(2)
      .prepare();
  }

  override async getSessionAndUser(sessionId: string): Promise<[session: DatabaseSession | null, user: DatabaseUser | null]> {
    const rows = await this.sessionAndUser.execute({ sessionId });
    const row = rows[0];
    if (rows.length !== 1 || !row) return [null, null];
    const { id, userId, expiresAt, ...attributes } = row;
    return [
      { id, userId, expiresAt, attributes: {} },
      { id: userId, attributes },
    ];
  }
}

function createLucia() {
  const env = getEnv();
  const adapter = new SessionAdapter(getDb());
  return new Lucia(adapter, {
    sessionExpiresIn: new TimeSpan(env.SESSION_DAYS, "d"),
    sessionCookie: {
      name: "zw_session",
      expires: true,
      attributes: { secure: env.cookieSecure, sameSite: "lax", path: "/" },
    },
    getUserAttributes: (attributes) => ({
      email: attributes.email,
      name: attributes.name,
      role: attributes.role,
      programId: attributes.programId,
      status: attributes.status,
      companyId: attributes.companyId,
      isBillingManager: Boolean(attributes.isBillingManager),
    }),
  });
}

type AuthLucia = ReturnType<typeof createLucia>;

declare module "lucia" {
  interface Register {
    Lucia: AuthLucia;
    UserId: number;
    DatabaseUserAttributes: DatabaseUserAttributes;
  }
}

let instance: AuthLucia | undefined;
export function getLucia(): AuthLucia {
  instance ??= createLucia();
  return instance;
}
