"use server";

import { revalidatePath } from "next/cache";
import { validatedAction } from "@/lib/actions/validated-action";
import { decideTesterApproval, testerDecisionSchema } from "@/lib/data/testers";

export const decideTester = validatedAction(testerDecisionSchema, "testers.review", async (input, actor) => {
  await decideTesterApproval(actor!, input);
  revalidatePath("/inspector/testers");
  revalidatePath(`/inspector/testers/${input.approvalId}`);
  revalidatePath("/testers");
});
