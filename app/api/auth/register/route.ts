// POST /api/auth/register: a tester's self-registration (pending each program's approval).
import { createUserSession, setSessionCookie } from "@/lib/auth/session";
import { registerTester, testerRegistrationSchema } from "@/lib/data/accounts";
import { apiRoute, jsonResponse } from "@/lib/http/route";

export const POST = apiRoute({ permission: null, body: testerRegistrationSchema, maxBodyBytes: 16 * 1024 }, async ({ body }) => {
  const { userId } = await registerTester(body);
  const { token } = await createUserSession(userId);
  await setSessionCookie(token);
  return jsonResponse({ ok: true, userId }, { status: 201 });
});
