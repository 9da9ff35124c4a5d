"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { sendJson } from "./send-json";

interface DecisionPanelProps {
  reportId: number;
  reportNumber: string;
  reasons: { id: number; label: string; guidance: string | null }[];
  /** Errors or signals the inspector must have looked at before accepting. */
  findingsCount: number;
  isPass: boolean;
  nextReportId: number | null;
}

type Outcome = { kind: "accepted" | "returned"; certificateCode: string | null } | null;

export function DecisionPanel({ reportId, reportNumber, reasons, findingsCount, isPass, nextReportId }: DecisionPanelProps) {
  const router = useRouter();
  const [mode, setMode] = useState<"choose" | "return">("choose");
  const [picked, setPicked] = useState<number[]>([]);
  const [customReason, setCustomReason] = useState("");
  const [note, setNote] = useState("");
  const [hasLooked, setHasLooked] = useState(findingsCount === 0);
  const [isBusy, setIsBusy] = useState(false);
  const [error, setError] = useState<{ message: string; isConflict: boolean } | null>(null);
  const [outcome, setOutcome] = useState<Outcome>(null);

  const submit = async (decision: "accept" | "return") => {
    setIsBusy(true);
    setError(null);
    const result = await sendJson<{ status: "accepted" | "returned"; certificateCode: string | null }>("POST", `/api/inspector/reports/${reportId}/decision`, { decision, reasonIds: decision === "return" ? picked : [], customReason: decision === "return" ? customReason : "", note });
    setIsBusy(false);
    if (!result.ok) {
      setError({ message: result.fieldErrors.reasonIds?.[0] ?? result.error, isConflict: result.status === 409 });
      return;
    }
    setOutcome({ kind: result.data.status, certificateCode: result.data.certificateCode });
    router.refresh();
  };

  if (outcome) {
    return (
      <div className="space-y-3">
        <Alert tone={outcome.kind === "accepted" ? "success" : "warning"} title={outcome.kind === "accepted" ? `Report ${reportNumber} accepted` : `Report ${reportNumber} returned to the tester`} live>
          {outcome.kind === "accepted" ? (outcome.certificateCode ? `Compliance certificate ${outcome.certificateCode} issued. ` : "A failed test is on the record; no certificate. ") : "The reasons are on their way to the tester. "}
          {outcome.kind === "accepted" ? "The tester has been e-mailed." : ""}
        </Alert>
        <div className="flex flex-wrap gap-2">
          {nextReportId ? (
            <a href={`/inspector/reports/${nextReportId}`} className="inline-flex items-center rounded-md bg-estuary-700 px-4 py-2 font-semibold text-white no-underline hover:bg-estuary-800 hover:no-underline">
              Next waiting report →
            </a>
          ) : null}
          <a href="/inspector/reports" className="inline-flex items-center rounded-md border border-ink-200 bg-white px-4 py-2 font-semibold text-ink-900 no-underline hover:bg-ink-50 hover:no-underline">
            Back to the queue
          </a>
        </div>
      </div>
    );
  }

  return (
    <div className="space-y-4">
      {error ? (
        <Alert tone={error.isConflict ? "warning" : "danger"} title={error.isConflict ? "Already decided" : "Not saved"} live>
          {error.message}{" "}
          {error.isConflict ? (
            <button type="button" className="font-semibold underline" onClick={() => router.refresh()}>
              Show the decision
            </button>
          ) : null}
        </Alert>
      ) : null}
      {mode === "choose" ? (
        <>
          {findingsCount > 0 ? (
            <label className="flex items-start gap-2 rounded-md border border-caution-600/30 bg-caution-50 p-3 text-sm text-caution-700">
              <input type="checkbox" className="mt-0.5 h-4 w-4" checked={hasLooked} onChange={(e) => setHasLooked(e.target.checked)} />
              <span>
                I have looked at the {findingsCount === 1 ? "finding" : `${findingsCount} findings`} on this report and accept it {isPass ? "" : "as a failed test "}anyway.
              </span>
            </label>
          ) : null}
          <div className="space-y-1.5">
            <label htmlFor="decision-note" className="block text-sm font-semibold text-ink-800">
              Note to the tester <span className="font-normal text-ink-600">(optional, e-mailed)</span>
            </label>
            <textarea id="decision-note" className={inputClass} rows={2} maxLength={2000} value={note} onChange={(e) => setNote(e.target.value)} />
          </div>
          <div className="flex flex-wrap gap-2">
            <Button onClick={() => void submit("accept")} disabled={isBusy || !hasLooked}>
              {isPass ? "Accept and issue the certificate" : "Accept (failed test on record)"}
            </Button>
            <Button variant="danger" onClick={() => setMode("return")} disabled={isBusy}>
              Return for correction…
            </Button>
          </div>
        </>
      ) : (
        <form
          className="space-y-4"
          onSubmit={(e) => {
            e.preventDefault();
            void submit("return");
          }}
        >
          <fieldset className="space-y-2">
            <legend className="text-sm font-semibold text-ink-800">Why is it returned? Pick one or more.</legend>
            {reasons.map((reason) => (
              <label key={reason.id} className="flex items-start gap-2 rounded-md border border-ink-200 p-2.5 text-sm hover:bg-ink-50">
                <input type="checkbox" className="mt-0.5 h-4 w-4" checked={picked.includes(reason.id)} onChange={(e) => setPicked((p) => (e.target.checked ? [...p, reason.id] : p.filter((id) => id !== reason.id)))} />
                <span>
                  <span className="font-semibold text-ink-900">{reason.label}</span>
                  {reason.guidance ? <span className="block text-ink-600">{reason.guidance}</span> : null}
                </span>
              </label>
            ))}
          </fieldset>
          <div className="space-y-1.5">
            <label htmlFor="custom-reason" className="block text-sm font-semibold text-ink-800">
              Another reason, in your words
            </label>
            <input id="custom-reason" className={inputClass} maxLength={500} value={customReason} onChange={(e) => setCustomReason(e.target.value)} />
          </div>
          <div className="space-y-1.5">
            <label htmlFor="return-note" className="block text-sm font-semibold text-ink-800">
              Note to the tester <span className="font-normal text-ink-600">(optional)</span>
            </label>
            <textarea id="return-note" className={inputClass} rows={2} maxLength={2000} value={note} onChange={(e) => setNote(e.target.value)} />
          </div>
          <div className="flex flex-wrap gap-2">
            <Button type="submit" variant="danger" disabled={isBusy || (picked.length === 0 && customReason.trim() === "")}>
              Return the report
            </Button>
            <Button variant="secondary" onClick={() => setMode("choose")} disabled={isBusy}>
              Cancel
            </Button>
          </div>
        </form>
      )}
    </div>
  );
}
