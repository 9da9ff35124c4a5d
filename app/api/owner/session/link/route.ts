// POST /api/owner/session/link: an owner signs in with the single-use link from a notice e-mail (JSON clients).
import { z } from "zod";
import { createUserSession, setSessionCookie } from "@/lib/auth/session";
import { redeemOwnerLink } from "@/lib/data/owner-access";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: null, body: z.object({ token: z.string({ error: "The link's token is missing." }).min(1, "The link's token is missing.").max(100) }), maxBodyBytes: 4 * 1024 }, async ({ body }) => {
  const { userId } = await redeemOwnerLink(body.token);
  const { token } = await createUserSession(userId);
  await setSessionCookie(token);
  return { ok: true, home: "/owner" };
});
