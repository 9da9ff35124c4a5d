"use client";

import { useActionState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import type { ActionResult } from "@/lib/actions/validated-action";
import { registerAsTester } from "../actions";

export function RegisterForm({ programs }: { programs: { id: number; name: string }[] }) {
  const [state, formAction, isPending] = useActionState<ActionResult<void> | null, FormData>(registerAsTester, null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};
  return (
    <form action={formAction} className="space-y-4" noValidate>
      {state && !state.ok ? <Alert tone="danger" live>{state.error}</Alert> : null}
      <TextField id="name" label="Full name" autoComplete="name" required error={errors.name} />
      <TextField id="email" label="E-mail address" type="email" autoComplete="email" inputMode="email" required error={errors.email} />
      <TextField id="phone" label="Phone" type="tel" autoComplete="tel" inputMode="tel" required error={errors.phone} />
      <TextField id="companyName" label="Testing company (optional)" autoComplete="organization" error={errors.companyName} />
      <TextField id="password" label="Password" type="password" autoComplete="new-password" hint="At least 10 characters." required error={errors.password} />
      <fieldset className="space-y-2 rounded-md border border-ink-200 p-4">
        <legend className="px-1 text-sm font-semibold text-ink-800">Your tester certification</legend>
        <TextField id="certifyingBody" label="Certifying body" required error={errors.certifyingBody} />
        <TextField id="certificationNumber" label="Certificate number" required error={errors.certificationNumber} />
        <TextField id="certificationExpiresOn" label="Expires on" type="date" required error={errors.certificationExpiresOn} />
        <p className="text-sm text-ink-600">After signing in you can upload a copy of the certificate for the inspector to check.</p>
      </fieldset>
      <fieldset className="space-y-2 rounded-md border border-ink-200 p-4" aria-describedby={errors.programIds ? "programIds-error" : undefined}>
        <legend className="px-1 text-sm font-semibold text-ink-800">Programs you will file tests with</legend>
        {programs.map((p) => (
          <label key={p.id} className="flex min-h-11 items-center gap-3 text-base">
            <input type="checkbox" name="programIds" value={p.id} className="h-5 w-5 accent-estuary-700" />
            {p.name}
          </label>
        ))}
        {errors.programIds ? (
          <p id="programIds-error" role="alert" className="text-sm font-medium text-fail-700">
            {errors.programIds[0]}
          </p>
        ) : null}
        <p className="text-sm text-ink-600">Each program approves testers separately after checking the certificate.</p>
      </fieldset>
      <Button type="submit" size="lg" className="w-full" disabled={isPending}>
        {isPending ? "Registering…" : "Register"}
      </Button>
    </form>
  );
}
