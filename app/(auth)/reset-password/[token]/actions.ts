"use server";

import { redirect } from "next/navigation";
import { validatedAction } from "@/lib/actions/validated-action";
import { resetPassword } from "@/lib/data/accounts";
import { setPasswordSchema } from "@/lib/data/password-form";

export const chooseNewPassword = validatedAction(setPasswordSchema, null, async (input) => {
  await resetPassword(input.token, input.password);
  redirect("/login?reset=1");
});
