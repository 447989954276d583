import { redirect } from "next/navigation";
import { getDb } from "@/db";
import { getClinic } from "@/db/queries/clinics";
import { FollowUpQueue } from "@/components/follow-ups/queue";
import { PageTitle } from "@/components/ui/card";
import { currentActor } from "@/lib/auth/guard";
import { CHART_STAFF } from "@/lib/chart/access";
import { clinicToday } from "@/lib/chart/chart";
import { buildQueue } from "@/lib/chart/follow-ups";

export const metadata = { title: "Follow-ups" };

export default async function FollowUpsPage() {
  const actor = await currentActor();
  if (!actor) redirect("/sign-in");
  if (!(CHART_STAFF as readonly string[]).includes(actor.role)) redirect("/home");
  const db = getDb();
  const clinic = await getClinic(db, actor.clinicId);
  const today = await clinicToday(db, actor.clinicId);
  const groups = await buildQueue(db, actor.clinicId, today);
  return (
    <div>
      <PageTitle title="In-person follow-ups" subtitle="Every motion that still needs a resisted or palpation test, or a check of the camera reading, most urgent first." />
      <FollowUpQueue initial={JSON.parse(JSON.stringify({ today, groups }))} timezone={clinic?.timezone ?? "UTC"} />
    </div>
  );
}
