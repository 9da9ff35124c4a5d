"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import type { ActionResult } from "@/lib/actions/validated-action";
import { decideTester } from "./actions";

type Decision = "approve" | "reject" | "suspend" | "reinstate";
const labels: Record<Decision, string> = { approve: "Approve", reject: "Reject", suspend: "Suspend", reinstate: "Reinstate" };

export function DecisionForm({ approvalId, decisions, testerName }: { approvalId: number; decisions: Decision[]; testerName: string }) {
  const [state, formAction, isPending] = useActionState<ActionResult<void> | null, FormData>(decideTester, null);
  const needsReason = decisions.some((d) => d === "reject" || d === "suspend");
  return (
    <form action={formAction} className="flex flex-wrap items-end gap-2">
      <input type="hidden" name="approvalId" value={approvalId} />
      {needsReason ? (
        <label className="min-w-56 flex-1 text-sm">
          <span className="sr-only">Reason for {testerName}</span>
          <input name="reason" placeholder="Reason (needed to reject or suspend)" className={inputClass} maxLength={500} />
        </label>
      ) : null}
      {decisions.map((d) => (
        <Button key={d} type="submit" name="decision" value={d} variant={d === "approve" || d === "reinstate" ? "primary" : "danger"} size="sm" disabled={isPending}>
          {labels[d]}
        </Button>
      ))}
      {state && !state.ok ? (
        <p role="alert" className="w-full text-sm font-medium text-fail-700">
          {state.fieldErrors?.reason?.[0] ?? state.error}
        </p>
      ) : null}
      {state?.ok ? (
        <p role="status" className="w-full text-sm font-medium text-pass-700">
          Done: the tester has been e-mailed and the decision is in the audit log.
        </p>
      ) : null}
    </form>
  );
}
