"use client";

import { useState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";

/** For the program's staff: a new code for this certificate; the old one then verifies as replaced. */
export function ReissueButton({ code }: { code: string }) {
  const [error, setError] = useState<string | null>(null);
  const [isBusy, setBusy] = useState(false);
  async function reissue() {
    if (!window.confirm("Re-issue this certificate? The current code will verify as replaced, and the owner must use the new certificate.")) return;
    setBusy(true);
    setError(null);
    const response = await fetch(`/api/certificates/${code}/reissue`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ confirm: true }) }).catch(() => null);
    const body = (await response?.json().catch(() => null)) as { code?: string; error?: string } | null;
    setBusy(false);
    if (response?.ok && body?.code) window.location.assign(`/verify/${body.code}?reissued=1`);
    else setError(body?.error ?? "The certificate could not be re-issued. Please try again.");
  }
  return (
    <div className="space-y-2">
      {error ? (
        <Alert tone="danger" live>
          {error}
        </Alert>
      ) : null}
      <Button variant="secondary" onClick={() => void reissue()} disabled={isBusy}>
        {isBusy ? "Re-issuing…" : "Re-issue this certificate"}
      </Button>
    </div>
  );
}
