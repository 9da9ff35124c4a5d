"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import useSWR from "swr";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import type { NoticeRunView } from "@/lib/data/notices-log";

const fetchRun = async (url: string): Promise<NoticeRunView> => {
  const response = await fetch(url, { cache: "no-store" });
  if (!response.ok) throw new Error(`status ${response.status}`);
  return ((await response.json()) as { run: NoticeRunView }).run;
};

/** The admin's button: starts today's run, then follows it with a progress bar until it ends. */
export function RunPanel({ canRun, running }: { canRun: boolean; running: NoticeRunView | null }) {
  const router = useRouter();
  const [runId, setRunId] = useState<number | null>(running?.id ?? null);
  const [error, setError] = useState<string | null>(null);
  const [isStarting, setStarting] = useState(false);
  const { data: run } = useSWR(runId ? `/api/notices/runs/${runId}` : null, fetchRun, {
    fallbackData: running && running.id === runId ? running : undefined,
    refreshInterval: (latest) => (latest && latest.status !== "running" ? 0 : 1000),
    onSuccess: (latest) => {
      if (latest.status !== "running") router.refresh();
    },
  });

  async function start() {
    setStarting(true);
    setError(null);
    const response = await fetch("/api/notices/runs", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ confirm: true }) }).catch(() => null);
    const body = (await response?.json().catch(() => null)) as { runId?: number; error?: string } | null;
    setStarting(false);
    if (response?.ok && body?.runId) setRunId(body.runId);
    else setError(body?.error ?? "The run could not be started. Please try again.");
  }

  const isRunning = run?.status === "running";
  return (
    <div className="space-y-3">
      {canRun ? (
        <Button onClick={() => void start()} disabled={isStarting || isRunning} size="lg">
          {isStarting ? "Starting…" : isRunning ? "Sending…" : "Run today's notices now"}
        </Button>
      ) : (
        <p className="text-sm text-ink-600">Runs start on the schedule, or when a program admin presses the button. Each notice goes out once, however often it runs.</p>
      )}
      {error ? (
        <Alert tone="danger" live>
          {error}
        </Alert>
      ) : null}
      {run ? (
        <div className="space-y-2" aria-live="polite">
          <div className="flex items-center justify-between text-sm">
            <span className="font-semibold">
              Run #{run.id}: {run.status === "running" ? "sending" : run.status}
            </span>
            <span className="tabular-nums text-ink-600">{run.percent}%</span>
          </div>
          <div role="progressbar" aria-label="Notice run progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={run.percent} className="h-3 w-full overflow-hidden rounded-full bg-ink-100">
            <div className={`h-full rounded-full transition-all ${run.status === "failed" ? "bg-fail-600" : "bg-estuary-600"}`} style={{ width: `${run.percent}%` }} />
          </div>
          <p className="text-sm text-ink-700">
            {run.planned} planned · {run.sent} e-mails sent · {run.failed} failed · {run.letters} letters
          </p>
          {run.status !== "running" ? (
            <Alert tone={run.status === "finished" ? "success" : run.status === "skipped" ? "info" : "warning"} live>
              {run.log.at(-1)?.replace(/^\S+ /, "") ?? "The run ended."}
            </Alert>
          ) : null}
          <details>
            <summary className="cursor-pointer text-sm font-semibold">Log of this run</summary>
            <pre className="mt-2 max-h-64 overflow-y-auto whitespace-pre-wrap rounded bg-ink-50 p-3 text-xs">{run.log.join("\n")}</pre>
          </details>
        </div>
      ) : null}
    </div>
  );
}
