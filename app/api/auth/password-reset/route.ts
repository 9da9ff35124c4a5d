// POST /api/auth/password-reset: e-mails a single-use link; answers the same whether or not the account exists.
import { z } from "zod";
import { emailSchema, requestPasswordReset } from "@/lib/data/accounts";
import { clientAddress } from "@/lib/http/client-address";
import { apiRoute, jsonResponse } from "@/lib/http/route";

export const POST = apiRoute({ permission: null, body: z.object({ email: emailSchema }), maxBodyBytes: 4 * 1024 }, async ({ body, request }) => {
  await requestPasswordReset({ email: body.email, address: clientAddress(request.headers) });
  return jsonResponse({ ok: true, message: "If this address has an account, a link to choose a new password is on its way." }, { status: 202 });
});
