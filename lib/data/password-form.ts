import { z } from "zod";
import { newPasswordSchema } from "./accounts";

/** The set-password form's input: a token and the new password typed twice. */
export const setPasswordSchema = z
  .object({ token: z.string().min(20).max(64), password: newPasswordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords are not the same." });
