import { notFound } from "next/navigation";
import { getDb } from "@/db";
import { getClinic } from "@/db/queries/clinics";
import { ClinicSettingsForm } from "@/components/clinic/clinic-settings-form";
import { Card, PageTitle } from "@/components/ui/card";
import { currentActor } from "@/lib/auth/guard";
import { RANGE_TABLE_IDS, RANGE_TABLES } from "@/lib/motions/catalog";

export const metadata = { title: "Clinic settings" };

export default async function ClinicSettingsPage() {
  const actor = await currentActor();
  if (!actor || actor.role !== "admin") notFound();
  const clinic = await getClinic(getDb(), actor.clinicId);
  if (!clinic) notFound();
  return (
    <>
      <PageTitle title="Clinic settings" subtitle="Defaults for every therapist in the clinic. Each grade keeps the table and threshold it was made with." />
      <Card>
        <ClinicSettingsForm initial={clinic} tables={RANGE_TABLE_IDS.map((id) => ({ value: id, label: RANGE_TABLES[id].label }))} />
      </Card>
    </>
  );
}
