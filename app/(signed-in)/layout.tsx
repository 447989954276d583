import { redirect } from "next/navigation";
import { getDb } from "@/db";
import { getClinic } from "@/db/queries/clinics";
import { AppShell } from "@/components/app-shell";
import { currentActor } from "@/lib/auth/guard";

export default async function SignedInLayout({ children }: { children: React.ReactNode }) {
  const actor = await currentActor();
  if (!actor) redirect("/sign-in");
  const clinic = await getClinic(getDb(), actor.clinicId);
  return (
    <AppShell role={actor.role} name={actor.name} clinicName={clinic?.name ?? ""}>
      {children}
    </AppShell>
  );
}
