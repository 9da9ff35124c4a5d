"use server";

import { revalidatePath } from "next/cache";
import { validatedAction } from "@/lib/actions/validated-action";
import { addOwnerContactEmail, ownerContactSchema } from "@/lib/data/owner-portal";

export const addContactEmail = validatedAction(ownerContactSchema, "owner.portal", async (input, actor) => {
  await addOwnerContactEmail(actor!, input);
  revalidatePath("/owner");
  return { email: input.email };
});
