"use client";

import { useActionState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import type { ActionResult } from "@/lib/actions/validated-action";
import { continueWithLink } from "./actions";

export function ContinueForm({ token }: { token: string }) {
  const [state, formAction, isPending] = useActionState<ActionResult<void> | null, FormData>(continueWithLink, null);
  return (
    <form action={formAction} className="space-y-4">
      {state && !state.ok ? (
        <Alert tone="danger" live>
          {state.error}
        </Alert>
      ) : null}
      <input type="hidden" name="token" value={token} />
      <Button type="submit" size="lg" className="w-full" disabled={isPending}>
        {isPending ? "Signing in…" : "See my assemblies"}
      </Button>
    </form>
  );
}
