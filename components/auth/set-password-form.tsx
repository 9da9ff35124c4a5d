"use client";

import { useActionState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import type { ActionResult } from "@/lib/actions/validated-action";

/** The shared form behind "reset password" and "accept invitation". */
export function SetPasswordForm({ token, action, submitLabel }: { token: string; action: (state: unknown, formData: FormData) => Promise<ActionResult<void>>; submitLabel: string }) {
  const [state, formAction, isPending] = useActionState<ActionResult<void> | null, FormData>(action, null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};
  return (
    <form action={formAction} className="space-y-4" noValidate>
      {state && !state.ok ? <Alert tone="danger" live>{state.error}</Alert> : null}
      <input type="hidden" name="token" value={token} />
      <TextField id="password" label="New password" type="password" autoComplete="new-password" hint="At least 10 characters." required error={errors.password} />
      <TextField id="confirm" label="The same password again" type="password" autoComplete="new-password" required error={errors.confirm} />
      <Button type="submit" size="lg" className="w-full" disabled={isPending}>
        {isPending ? "Saving…" : submitLabel}
      </Button>
    </form>
  );
}
