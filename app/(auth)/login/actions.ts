"use server";

import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { z } from "zod";
import { validatedAction } from "@/lib/actions/validated-action";
import { homePathFor } from "@/lib/auth/guards";
import { safeNextPath } from "@/lib/auth/redirects";
import { createUserSession, setSessionCookie, signOutCurrentSession, validateSessionToken } from "@/lib/auth/session";
import { emailSchema, verifySignIn } from "@/lib/data/accounts";
import { clientAddress } from "@/lib/http/client-address";

const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, "Enter your password.").max(200, "That password is too long."),
  next: z.string().max(500).optional(),
});

export const signIn = validatedAction(signInSchema, null, async (input) => {
  const { userId } = await verifySignIn({ email: input.email, password: input.password, address: clientAddress(await headers()) });
  const { token } = await createUserSession(userId);
  await setSessionCookie(token);
  const signedIn = await validateSessionToken(token);
  redirect(safeNextPath(input.next) ?? (signedIn ? homePathFor(signedIn.actor) : "/"));
});

export async function signOut(): Promise<void> {
  await signOutCurrentSession();
  redirect("/login?signedOut=1");
}

