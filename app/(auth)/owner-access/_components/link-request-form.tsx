"use client";

import { useActionState, useState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import type { ActionResult } from "@/lib/actions/validated-action";
import { requestSignInLink } from "../actions";

export function LinkRequestForm() {
  const [state, formAction, isPending] = useActionState<ActionResult<{ email: string }> | null, FormData>(requestSignInLink, null);
  const [email, setEmail] = useState("");
  if (state?.ok) {
    return (
      <Alert tone="success" live title="Check your e-mail">
        If {state.data.email} is the address a water program has on file for a property, a sign-in link is on its way. It works once, for 30 days.
      </Alert>
    );
  }
  return (
    <form action={formAction} className="space-y-4" noValidate>
      {state && !state.ok ? (
        <Alert tone="danger" live>
          {state.error}
        </Alert>
      ) : null}
      <TextField id="email" label="E-mail address" value={email} onChange={(e) => setEmail(e.target.value)} type="email" autoComplete="email" inputMode="email" required hint="The address the program sends its notices to." error={state && !state.ok ? state.fieldErrors?.email : undefined} />
      <Button type="submit" variant="secondary" className="w-full" disabled={isPending}>
        {isPending ? "Sending…" : "E-mail me a sign-in link"}
      </Button>
    </form>
  );
}
