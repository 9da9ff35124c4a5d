"use client";

import { useActionState, useState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import type { ActionResult } from "@/lib/actions/validated-action";
import { signInWithCode } from "../actions";

export function CodeForm() {
  const [state, formAction, isPending] = useActionState<ActionResult<void> | null, FormData>(signInWithCode, null);
  const fieldErrors = state && !state.ok ? state.fieldErrors : undefined;
  // Kept across a refused attempt (a form action resets uncontrolled fields): only the code needs retyping.
  const [accountNumber, setAccountNumber] = useState("");
  const [code, setCode] = useState("");
  return (
    <form action={formAction} className="space-y-4" noValidate>
      {state && !state.ok ? (
        <Alert tone="danger" live>
          {state.error}
        </Alert>
      ) : null}
      <TextField id="accountNumber" label="Account number" value={accountNumber} onChange={(e) => setAccountNumber(e.target.value)} autoComplete="off" autoCapitalize="characters" spellCheck={false} required hint="Printed on the letter, beside the code." error={fieldErrors?.accountNumber} />
      <TextField id="code" label="One-time code" value={code} onChange={(e) => setCode(e.target.value)} autoComplete="one-time-code" autoCapitalize="characters" spellCheck={false} required hint="10 letters and digits, printed like ABCDE-FGHJK. It works once." error={fieldErrors?.code} />
      <Button type="submit" size="lg" className="w-full" disabled={isPending}>
        {isPending ? "Checking…" : "See my assemblies"}
      </Button>
    </form>
  );
}
