// POST /api/auth/password-reset/confirm: spends a reset link's token and sets the new password.
import { resetPassword } from "@/lib/data/accounts";
import { setPasswordSchema } from "@/lib/data/password-form";
import { apiRoute } from "@/lib/http/route";

export const POST = apiRoute({ permission: null, body: setPasswordSchema, maxBodyBytes: 4 * 1024 }, async ({ body }) => {
  await resetPassword(body.token, body.password);
  return { ok: true, message: "Your password is changed. Sign in with the new one." };
});
