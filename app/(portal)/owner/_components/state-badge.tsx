import { Badge, type BadgeTone } from "@/components/ui/badge";
import type { OwnerTone } from "@/lib/data/owner-portal";

const toneToBadge: Record<OwnerTone, BadgeTone> = { pass: "pass", fail: "fail", caution: "caution", neutral: "neutral", muted: "muted" };
const marks: Record<OwnerTone, string> = { pass: "✓", fail: "!", caution: "•", neutral: "•", muted: "–" };

/** The compliance state as a word with a mark, never colour alone. */
export function StateBadge({ tone, label }: { tone: OwnerTone; label: string }) {
  return (
    <Badge tone={toneToBadge[tone]}>
      <span aria-hidden="true">{marks[tone]}</span>
      {label}
    </Badge>
  );
}
