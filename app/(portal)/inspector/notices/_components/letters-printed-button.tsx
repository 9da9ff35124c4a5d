"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";

export function LettersPrintedButton({ runId }: { runId: number }) {
  const router = useRouter();
  const [message, setMessage] = useState<string | null>(null);
  const [isBusy, setBusy] = useState(false);
  async function mark() {
    setBusy(true);
    const response = await fetch(`/api/notices/runs/${runId}/letters`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ printed: true }) }).catch(() => null);
    const body = (await response?.json().catch(() => null)) as { marked?: number; error?: string } | null;
    setBusy(false);
    if (response?.ok) router.refresh();
    else setMessage(body?.error ?? "Could not mark the letters. Please try again.");
  }
  return (
    <span className="inline-flex items-center gap-2">
      <Button size="sm" variant="secondary" onClick={() => void mark()} disabled={isBusy}>
        Mark as printed
      </Button>
      {message ? <span className="text-sm text-fail-700">{message}</span> : null}
    </span>
  );
}
