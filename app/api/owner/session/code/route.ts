// POST /api/owner/session/code: an owner signs in with the account number and one-time code from a letter (JSON clients).
import { createUserSession, setSessionCookie } from "@/lib/auth/session";
import { ownerCodeSchema, redeemOwnerCode } from "@/lib/data/owner-access";
import { clientAddress } from "@/lib/http/client-address";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: null, body: ownerCodeSchema, maxBodyBytes: 4 * 1024 }, async ({ body, request }) => {
  const { userId } = await redeemOwnerCode({ ...body, address: clientAddress(request.headers) });
  const { token } = await createUserSession(userId);
  await setSessionCookie(token);
  return { ok: true, home: "/owner" };
});
