"use client";

import { useActionState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import type { ActionResult } from "@/lib/actions/validated-action";
import { askForPasswordReset } from "./actions";

export function ForgotPasswordForm() {
  const [state, formAction, isPending] = useActionState<ActionResult<{ email: string }> | null, FormData>(askForPasswordReset, null);
  if (state?.ok) {
    return (
      <Alert tone="success" live title="Check your e-mail">
        If {state.data.email} has an account, a link to choose a new password is on its way. It works once, for one hour.
      </Alert>
    );
  }
  return (
    <form action={formAction} className="space-y-4" noValidate>
      {state && !state.ok ? <Alert tone="danger" live>{state.error}</Alert> : null}
      <TextField id="email" label="E-mail address" type="email" autoComplete="username" inputMode="email" required error={state && !state.ok ? state.fieldErrors?.email : undefined} />
      <Button type="submit" size="lg" className="w-full" disabled={isPending}>
        {isPending ? "Sending…" : "Send me a link"}
      </Button>
    </form>
  );
}
