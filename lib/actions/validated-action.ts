import "server-only";
import { z } from "zod";
import { can, type Actor, type Permission } from "@/lib/auth/permissions";
import { getActor } from "@/lib/auth/session";
import { AppError, InputError, isDatabaseUnavailable, type FieldErrors } from "@/lib/errors";
import { fieldErrorsOf } from "@/lib/http/route";

export type ActionResult<T = undefined> = { ok: true; data: T; message?: string } | { ok: false; error: string; fieldErrors?: FieldErrors };

/** FormData → plain object: repeated names become arrays, "on" checkboxes stay strings for zod. */
export function formDataToObject(formData: FormData): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [key, value] of formData.entries()) {
    if (key.startsWith("$ACTION")) continue;
    if (key in out) {
      const existing = out[key];
      out[key] = Array.isArray(existing) ? [...(existing as unknown[]), value] : [existing, value];
    } else out[key] = value;
  }
  return out;
}

function failureFor(error: unknown): ActionResult<never> {
  if (error instanceof InputError) return { ok: false, error: error.message, fieldErrors: error.fieldErrors };
  if (error instanceof AppError) return { ok: false, error: error.message };
  if (isDatabaseUnavailable(error)) return { ok: false, error: "The service is briefly unavailable. Your work is kept; please try again in a few seconds." };
  // Next uses thrown errors for redirect() and notFound(): let those through.
  throw error;
}

/**
 * The one wrapper for server actions: validate with zod → load the actor → check the
 * permission → do the work → return { ok } | { error }. Works with useActionState
 * (prevState, formData) and with a plain object argument.
 */
export function validatedAction<S extends z.ZodType, T>(
  schema: S,
  permission: Permission | null,
  work: (input: z.output<S>, actor: Actor | null) => Promise<T>,
): (prevStateOrInput: unknown, formData?: FormData) => Promise<ActionResult<T>> {
  return async (prevStateOrInput, formData) => {
    const raw = formData instanceof FormData ? formDataToObject(formData) : prevStateOrInput instanceof FormData ? formDataToObject(prevStateOrInput) : prevStateOrInput;
    const parsed = schema.safeParse(raw ?? {});
    if (!parsed.success) {
      const fieldErrors = fieldErrorsOf(parsed.error);
      return { ok: false, error: "Please check the highlighted fields.", fieldErrors };
    }
    try {
      const actor = await getActor();
      if (permission !== null) {
        if (!actor) return { ok: false, error: "Your session has ended. Please sign in again." };
        if (!can(actor, permission)) return { ok: false, error: "You are not allowed to do this." };
      }
      const data = await work(parsed.data, actor);
      return { ok: true, data };
    } catch (error) {
      return failureFor(error);
    }
  };
}
