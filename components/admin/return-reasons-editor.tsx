"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { JsonForm, textOf } from "@/components/inspector/json-form";
import { sendJson } from "@/components/inspector/send-json";

export interface ReasonRow {
  id: number;
  label: string;
  guidance: string | null;
  isActive: boolean;
}

function ReasonItem({ reason, isFirst, isLast }: { reason: ReasonRow; isFirst: boolean; isLast: boolean }) {
  const router = useRouter();
  const [isEditing, setIsEditing] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const patch = async (changes: Partial<ReasonRow> & { move?: "up" | "down" }) => {
    const result = await sendJson("PATCH", `/api/admin/return-reasons/${reason.id}`, { label: reason.label, guidance: reason.guidance ?? "", isActive: reason.isActive, ...changes });
    setError(result.ok ? null : result.error);
    router.refresh();
  };
  if (isEditing) {
    return (
      <li className="py-3">
        <JsonForm
          method="PATCH"
          url={`/api/admin/return-reasons/${reason.id}`}
          toBody={(d) => ({ label: textOf(d, "label"), guidance: textOf(d, "guidance"), isActive: reason.isActive })}
          submitLabel="Save"
          onSuccess={() => setIsEditing(false)}
          extraActions={
            <Button variant="secondary" onClick={() => setIsEditing(false)}>
              Cancel
            </Button>
          }
        >
          {(errors) => (
            <>
              <label className="block text-sm font-semibold" htmlFor={`label-${reason.id}`}>
                Reason
              </label>
              <input id={`label-${reason.id}`} name="label" className={inputClass} defaultValue={reason.label} maxLength={200} />
              {errors.label ? <p className="text-sm text-fail-700">{errors.label[0]}</p> : null}
              <label className="block text-sm font-semibold" htmlFor={`guidance-${reason.id}`}>
                What the tester should do
              </label>
              <textarea id={`guidance-${reason.id}`} name="guidance" rows={2} className={inputClass} defaultValue={reason.guidance ?? ""} maxLength={1000} />
            </>
          )}
        </JsonForm>
      </li>
    );
  }
  return (
    <li className="flex flex-wrap items-start justify-between gap-3 py-3">
      <div className={reason.isActive ? "" : "text-ink-600"}>
        <p className="font-semibold">
          {reason.label} {reason.isActive ? null : <Badge tone="muted">retired</Badge>}
        </p>
        {reason.guidance ? <p className="text-sm text-ink-600">{reason.guidance}</p> : null}
        {error ? <p className="text-sm text-fail-700">{error}</p> : null}
      </div>
      <div className="flex flex-wrap gap-1">
        <Button size="sm" variant="ghost" disabled={isFirst} onClick={() => void patch({ move: "up" })} aria-label={`Move “${reason.label}” up`}>
          ↑
        </Button>
        <Button size="sm" variant="ghost" disabled={isLast} onClick={() => void patch({ move: "down" })} aria-label={`Move “${reason.label}” down`}>
          ↓
        </Button>
        <Button size="sm" variant="secondary" onClick={() => setIsEditing(true)}>
          Edit
        </Button>
        <Button size="sm" variant="secondary" onClick={() => void patch({ isActive: !reason.isActive })}>
          {reason.isActive ? "Retire" : "Restore"}
        </Button>
      </div>
    </li>
  );
}

export function ReturnReasonsEditor({ reasons }: { reasons: ReasonRow[] }) {
  return (
    <div className="space-y-6">
      <ul className="divide-y divide-ink-100">
        {reasons.map((r, i) => (
          <ReasonItem key={r.id} reason={r} isFirst={i === 0} isLast={i === reasons.length - 1} />
        ))}
      </ul>
      <div className="rounded-md border border-ink-200 p-4">
        <h3 className="mb-3 font-semibold">Add a reason</h3>
        <JsonForm method="POST" url="/api/admin/return-reasons" toBody={(d) => ({ label: textOf(d, "newLabel"), guidance: textOf(d, "newGuidance") })} submitLabel="Add the reason" successMessage="Added at the end of the list.">
          {(errors) => (
            <>
              <label className="block text-sm font-semibold" htmlFor="newLabel">
                Reason
              </label>
              <input id="newLabel" name="newLabel" className={inputClass} maxLength={200} placeholder="e.g. Line pressure not recorded" />
              {errors.label ? <p className="text-sm text-fail-700">{errors.label[0]}</p> : null}
              <label className="block text-sm font-semibold" htmlFor="newGuidance">
                What the tester should do <span className="font-normal text-ink-600">(optional)</span>
              </label>
              <textarea id="newGuidance" name="newGuidance" rows={2} className={inputClass} maxLength={1000} />
            </>
          )}
        </JsonForm>
      </div>
    </div>
  );
}
