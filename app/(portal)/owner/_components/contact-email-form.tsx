"use client";

import { useActionState, useState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import type { ActionResult } from "@/lib/actions/validated-action";
import { addContactEmail } from "../actions";

/** For an owner who signed in with a letter's code: add an address for e-mailed notices and sign-in links. */
export function ContactEmailForm() {
  const [state, formAction, isPending] = useActionState<ActionResult<{ email: string }> | null, FormData>(addContactEmail, null);
  const [email, setEmail] = useState("");
  if (state?.ok) return <Alert tone="success">Thank you. The program&apos;s next notices go to {state.data.email}, and you can ask for a sign-in link with it.</Alert>;
  return (
    <form action={formAction} className="flex flex-col gap-3 sm:flex-row sm:items-end" noValidate>
      <div className="flex-1">
        <TextField id="email" label="Your e-mail address" value={email} onChange={(e) => setEmail(e.target.value)} type="email" autoComplete="email" inputMode="email" required error={state && !state.ok ? (state.fieldErrors?.email ?? state.error) : undefined} />
      </div>
      <Button type="submit" disabled={isPending}>
        {isPending ? "Saving…" : "Save address"}
      </Button>
    </form>
  );
}
