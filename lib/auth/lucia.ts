import { DrizzleMySQLAdapter } from "@lucia-auth/adapter-drizzle";
import { Lucia, TimeSpan } from "lucia";
import { getDb } from "@/db/client";
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

function createLucia() {
  const env = getEnv();
  const adapter = new DrizzleMySQLAdapter(getDb(), sessions, users);
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
