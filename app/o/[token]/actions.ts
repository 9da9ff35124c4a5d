"use server";

import { redirect } from "next/navigation";
import { z } from "zod";
import { validatedAction } from "@/lib/actions/validated-action";
import { createUserSession, setSessionCookie, signOutCurrentSession } from "@/lib/auth/session";
import { redeemOwnerLink } from "@/lib/data/owner-access";

export const continueWithLink = validatedAction(z.object({ token: z.string().max(100) }), null, async (input) => {
  const { userId } = await redeemOwnerLink(input.token);
  // Whoever was signed in on this browser before, the link's owner is now.
  await signOutCurrentSession();
  const { token } = await createUserSession(userId);
  await setSessionCookie(token);
  redirect("/owner");
});
