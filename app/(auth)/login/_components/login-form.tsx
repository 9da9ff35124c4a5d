"use client";

import { useActionState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import type { ActionResult } from "@/lib/actions/validated-action";
import { signIn } from "../actions";

export function LoginForm({ next }: { next?: string }) {
  const [state, formAction, isPending] = useActionState<ActionResult<void> | null, FormData>(signIn, null);
  const fieldErrors = state && !state.ok ? state.fieldErrors : undefined;
  return (
    <form action={formAction} className="space-y-4" noValidate>
      {state && !state.ok ? <Alert tone="danger" live>{state.error}</Alert> : null}
      <input type="hidden" name="next" value={next ?? ""} />
      <TextField id="email" label="E-mail address" type="email" autoComplete="username" inputMode="email" required error={fieldErrors?.email} />
      <TextField id="password" label="Password" type="password" autoComplete="current-password" required error={fieldErrors?.password} />
      <Button type="submit" size="lg" className="w-full" disabled={isPending}>
        {isPending ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}
