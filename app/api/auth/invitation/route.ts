// POST /api/auth/invitation: accepts an invitation (sets the password, activates the account, signs in).
import { createUserSession, setSessionCookie } from "@/lib/auth/session";
import { acceptInvitation } from "@/lib/data/accounts";
import { setPasswordSchema } from "@/lib/data/password-form";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: null, body: setPasswordSchema, maxBodyBytes: 4 * 1024 }, async ({ body }) => {
  const { userId } = await acceptInvitation(body.token, body.password);
  const { token } = await createUserSession(userId);
  await setSessionCookie(token);
  return { ok: true };
});
