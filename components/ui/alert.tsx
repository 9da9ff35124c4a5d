import type { ReactNode } from "react";

type Tone = "info" | "success" | "warning" | "danger";
const tones: Record<Tone, string> = {
  info: "border-estuary-200 bg-estuary-50 text-estuary-900",
  success: "border-pass-600/30 bg-pass-50 text-pass-700",
  warning: "border-caution-600/30 bg-caution-50 text-caution-700",
  danger: "border-fail-600/30 bg-fail-50 text-fail-700",
};

export function Alert({ tone = "info", title, children, live = false }: { tone?: Tone; title?: ReactNode; children?: ReactNode; live?: boolean }) {
  return (
    <div role={live ? (tone === "danger" ? "alert" : "status") : undefined} className={`rounded-md border px-4 py-3 text-sm ${tones[tone]}`}>
      {title ? <p className="font-semibold">{title}</p> : null}
      {children ? <div className={title ? "mt-1" : ""}>{children}</div> : null}
    </div>
  );
}
