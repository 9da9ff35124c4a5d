"use client";

import { useEffect, useRef, useState } from "react";
import useSWR from "swr";
import { Alert } from "@/components/ui/alert";
import { formatCount, formatInstant } from "@/components/inspector/format";
import { fetchJson } from "@/components/inspector/send-json";
import type { RecomputeStatus } from "@/lib/data/settings";

/**
 * Where the recompute of due dates after a settings change has got to: a progress bar while it
 * runs (the page asks again every second), a warning when it was cut short, and a line when it
 * has finished while the page was open.
 */
export function RecomputeStatusPanel({ initial, timezone }: { initial: RecomputeStatus; timezone: string }) {
  // A new save starts a new recompute: follow that one.
  const { data } = useSWR<RecomputeStatus, Error>(["/api/admin/settings/recompute", initial.pendingSince], ([url]: [string]) => fetchJson<RecomputeStatus>(url), {
    fallbackData: initial,
    refreshInterval: (latest) => (latest?.pendingSince && !latest.isStalled ? 1000 : 0),
  });
  const status = data ?? initial;
  const wasPending = useRef(Boolean(initial.pendingSince));
  const [hasFinished, setHasFinished] = useState(false);
  useEffect(() => {
    if (status.pendingSince) wasPending.current = true;
    else if (wasPending.current) {
      wasPending.current = false;
      setHasFinished(true);
    }
  }, [status.pendingSince]);

  if (!status.pendingSince) {
    return hasFinished ? (
      <Alert tone="success" live title="Due dates are up to date">
        Every assembly&apos;s due date and repair deadline now follows the saved settings.
      </Alert>
    ) : null;
  }
  if (status.isStalled) {
    return (
      <Alert tone="warning" title="Due dates are still being recomputed">
        The change saved at {formatInstant(status.pendingSince, timezone)} moves due dates, and the recompute stopped
        {status.total ? ` after ${formatCount(status.done)} of ${formatCount(status.total)} assemblies` : ""} (it was cut short). The next notice run finishes it before it plans anything, and pressing Save below finishes it now.
      </Alert>
    );
  }
  return (
    <Alert tone="info" live title="Recomputing due dates">
      <p>
        {status.total ? `${formatCount(status.done)} of ${formatCount(status.total)} assemblies` : "Starting"}, after the change saved at {formatInstant(status.pendingSince, timezone)}. Reviews, submissions and this page carry on meanwhile; notices wait for it.
      </p>
      <progress className="mt-2 h-3 w-full accent-estuary-700" max={status.total || 1} value={status.done} aria-label="Recompute progress" />
    </Alert>
  );
}
