"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";

const words = {
  waive: { open: "Waive fee", confirm: "Waive the fee", placeholder: "Reason for waiving (kept in the audit log)", done: "Fee waived; the report is in the review queue." },
  refund: { open: "Refund", confirm: "Refund the fee", placeholder: "Reason for the refund (kept in the audit log)", done: "Refund requested; it shows as refunded once the payment service confirms it." },
} as const;

/** Waive an owed fee or refund a paid one, always with a reason. */
export function FeeActionForm({ reportId, report, action }: { reportId: number; report: string; action: "waive" | "refund" }) {
  const router = useRouter();
  const [isOpen, setIsOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [message, setMessage] = useState<{ tone: "error" | "ok"; text: string } | null>(null);
  const [isBusy, setIsBusy] = useState(false);
  const w = words[action];
  const fieldId = `${action}-reason-${reportId}`;

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setIsBusy(true);
    setMessage(null);
    try {
      const response = await fetch(`/api/fees/reports/${reportId}/${action}`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ reason }) });
      const body = (await response.json().catch(() => ({}))) as { error?: string; fieldErrors?: Record<string, string[]> };
      if (!response.ok) {
        setMessage({ tone: "error", text: body.fieldErrors?.reason?.[0] ?? body.error ?? "That did not work; please try again." });
        return;
      }
      setMessage({ tone: "ok", text: w.done });
      setIsOpen(false);
      router.refresh();
    } catch {
      setMessage({ tone: "error", text: "No connection; nothing was changed." });
    } finally {
      setIsBusy(false);
    }
  }

  return (
    <div>
      {isOpen ? (
        <form onSubmit={(e) => void submit(e)} className="flex flex-wrap items-end gap-2">
          <label htmlFor={fieldId} className="sr-only">
            {w.placeholder} for report {report}
          </label>
          <input id={fieldId} value={reason} onChange={(e) => setReason(e.target.value)} placeholder={w.placeholder} className={`${inputClass} min-w-64 flex-1`} maxLength={500} required minLength={5} />
          <Button type="submit" size="sm" variant={action === "refund" ? "danger" : "primary"} disabled={isBusy}>
            {isBusy ? "Working…" : w.confirm}
          </Button>
          <Button size="sm" variant="ghost" onClick={() => setIsOpen(false)} disabled={isBusy}>
            Cancel
          </Button>
        </form>
      ) : (
        <Button size="sm" variant="secondary" onClick={() => setIsOpen(true)} aria-label={`${w.open} for report ${report}`}>
          {w.open}
        </Button>
      )}
      {message ? (
        <p role={message.tone === "error" ? "alert" : "status"} className={`mt-1 text-sm font-medium ${message.tone === "error" ? "text-fail-700" : "text-pass-700"}`}>
          {message.text}
        </p>
      ) : null}
    </div>
  );
}
