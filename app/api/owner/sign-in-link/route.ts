// POST /api/owner/sign-in-link: e-mails a sign-in link to an owner's address on file; answers the same either way.
import { z } from "zod";
import { emailSchema } from "@/lib/data/accounts";
import { requestOwnerSignInLink } from "@/lib/data/owner-access";
import { clientAddress } from "@/lib/http/client-address";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: null, body: z.object({ email: emailSchema }), maxBodyBytes: 4 * 1024 }, async ({ body, request }) => {
  await requestOwnerSignInLink({ email: body.email, address: clientAddress(request.headers) });
  return { ok: true, message: "If this address is on file for a property, a sign-in link is on its way." };
});
