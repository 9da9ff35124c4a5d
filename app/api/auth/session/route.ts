// POST /api/auth/session: sign in with e-mail and password (JSON clients); DELETE: sign out.
import { z } from "zod";
import { createUserSession, setSessionCookie, signOutCurrentSession, validateSessionToken } from "@/lib/auth/session";
import { homePathFor } from "@/lib/auth/guards";
import { emailSchema, verifySignIn } from "@/lib/data/accounts";
import { clientAddress } from "@/lib/http/client-address";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: null, body: z.object({ email: emailSchema, password: z.string().min(1, "Enter your password.").max(200) }), maxBodyBytes: 8 * 1024 }, async ({ body, request }) => {
  const { userId } = await verifySignIn({ email: body.email, password: body.password, address: clientAddress(request.headers) });
  const { token, expiresAt } = await createUserSession(userId);
  await setSessionCookie(token);
  const signedIn = await validateSessionToken(token);
  return { ok: true, role: signedIn?.actor.role, home: signedIn ? homePathFor(signedIn.actor) : "/", expiresAt };
});

export const DELETE = apiRoute({ permission: null }, async () => {
  await signOutCurrentSession();
  return { ok: true };
});
