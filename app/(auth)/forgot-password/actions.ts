"use server";

import { headers } from "next/headers";
import { z } from "zod";
import { validatedAction } from "@/lib/actions/validated-action";
import { emailSchema, requestPasswordReset } from "@/lib/data/accounts";
import { clientAddress } from "@/lib/http/client-address";

export const askForPasswordReset = validatedAction(z.object({ email: emailSchema }), null, async (input) => {
  await requestPasswordReset({ email: input.email, address: clientAddress(await headers()) });
  return { email: input.email };
});
