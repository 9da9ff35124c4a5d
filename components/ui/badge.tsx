import type { ReactNode } from "react";

export type BadgeTone = "neutral" | "brand" | "pass" | "fail" | "caution" | "muted";
const tones: Record<BadgeTone, string> = {
  neutral: "bg-ink-100 text-ink-800",
  brand: "bg-estuary-100 text-estuary-800",
  pass: "bg-pass-50 text-pass-700 ring-1 ring-pass-600/30",
  fail: "bg-fail-50 text-fail-700 ring-1 ring-fail-600/30",
  caution: "bg-caution-50 text-caution-700 ring-1 ring-caution-600/30",
  muted: "bg-white text-ink-600 ring-1 ring-ink-200",
};

export function Badge({ tone = "neutral", children }: { tone?: BadgeTone; children: ReactNode }) {
  return <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full px-2.5 py-0.5 text-xs font-semibold ${tones[tone]}`}>{children}</span>;
}
