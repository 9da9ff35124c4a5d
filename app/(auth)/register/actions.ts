"use server";

import { redirect } from "next/navigation";
import { validatedAction } from "@/lib/actions/validated-action";
import { createUserSession, setSessionCookie } from "@/lib/auth/session";
import { registerTester, testerRegistrationSchema } from "@/lib/data/accounts";

export const registerAsTester = validatedAction(testerRegistrationSchema, null, async (input) => {
  const { userId } = await registerTester(input);
  const { token } = await createUserSession(userId);
  await setSessionCookie(token);
  redirect("/tester?registered=1");
});
