import type { VisitStatus } from "@/db/schema";
import { Badge } from "@/components/ui/card";

const LABELS: Record<VisitStatus, { text: string; tone: "neutral" | "caution" | "alert" | "good" }> = {
  scheduled: { text: "Booked", tone: "neutral" },
  waiting: { text: "Client waiting", tone: "caution" },
  in_progress: { text: "Under way", tone: "good" },
  finished: { text: "Done", tone: "neutral" },
  cancelled: { text: "Cancelled", tone: "alert" },
  missed: { text: "Missed", tone: "alert" },
};

export function VisitStatusBadge({ status }: { status: VisitStatus }) {
  const l = LABELS[status];
  return <Badge tone={l.tone}>{l.text}</Badge>;
}
