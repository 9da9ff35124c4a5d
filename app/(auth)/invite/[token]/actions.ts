"use server";

import { redirect } from "next/navigation";
import { validatedAction } from "@/lib/actions/validated-action";
import { createUserSession, setSessionCookie } from "@/lib/auth/session";
import { acceptInvitation } from "@/lib/data/accounts";
import { setPasswordSchema } from "@/lib/data/password-form";

export const finishInvitation = validatedAction(setPasswordSchema, null, async (input) => {
  const { userId } = await acceptInvitation(input.token, input.password);
  const { token } = await createUserSession(userId);
  await setSessionCookie(token);
  redirect("/");
});
