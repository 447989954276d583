import { notFound } from "next/navigation";
import { getDb } from "@/db";
import { listTherapists } from "@/db/queries/users";
import { ClientForm } from "@/components/clients/client-form";
import { PageTitle } from "@/components/ui/card";
import { currentActor } from "@/lib/auth/guard";
import { CLIENT_EDITORS } from "@/lib/clients";
import { createClientAction } from "../actions";

export const metadata = { title: "Add a client" };

export default async function NewClientPage() {
  const actor = await currentActor();
  if (!actor || !(CLIENT_EDITORS as readonly string[]).includes(actor.role)) notFound();
  const therapists = await listTherapists(getDb(), actor.clinicId);
  return (
    <>
      <PageTitle title="Add a client" subtitle="The clinic's record of the person; clinical measurements come later." />
      <ClientForm
        action={createClientAction}
        initial={{ primaryTherapistId: actor.role === "therapist" ? actor.userId : null }}
        therapists={therapists}
        cancelHref="/clients"
        submitLabel="Save client"
      />
    </>
  );
}
