"use server";

import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { z } from "zod";
import { validatedAction } from "@/lib/actions/validated-action";
import { createUserSession, setSessionCookie } from "@/lib/auth/session";
import { emailSchema } from "@/lib/data/accounts";
import { ownerCodeSchema, redeemOwnerCode, requestOwnerSignInLink } from "@/lib/data/owner-access";
import { clientAddress } from "@/lib/http/client-address";

export const signInWithCode = validatedAction(ownerCodeSchema, null, async (input) => {
  const { userId } = await redeemOwnerCode({ ...input, address: clientAddress(await headers()) });
  const { token } = await createUserSession(userId);
  await setSessionCookie(token);
  redirect("/owner");
});

export const requestSignInLink = validatedAction(z.object({ email: emailSchema }), null, async (input) => {
  await requestOwnerSignInLink({ email: input.email, address: clientAddress(await headers()) });
  return { email: input.email };
});
