// POST /api/owner/contact: an owner who signed in with a letter's code adds an e-mail address for notices.
import { addOwnerContactEmail, ownerContactSchema } from "@/lib/data/owner-portal";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: "owner.portal", body: ownerContactSchema, maxBodyBytes: 4 * 1024 }, async ({ actor, body }) => {
  await addOwnerContactEmail(actor, body);
  return { ok: true };
});
