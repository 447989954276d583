import { headers } from "next/headers";
import { notFound, redirect } from "next/navigation";
import { getDb } from "@/db";
import { listTherapists } from "@/db/queries/users";
import { ClientForm } from "@/components/clients/client-form";
import { PageTitle } from "@/components/ui/card";
import { AccessError, currentActor, requestAddress, requireClientRecord } from "@/lib/auth/guard";
import { CLIENT_EDITORS } from "@/lib/clients";
import { updateClientAction } from "../../actions";

export const metadata = { title: "Edit client" };

export default async function EditClientPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const actor = await currentActor();
  if (!actor) redirect("/sign-in");
  if (!(CLIENT_EDITORS as readonly string[]).includes(actor.role)) notFound();
  const record = await requireClientRecord(actor, id, { address: requestAddress(await headers()), purpose: "edit" }).catch((error) => {
    if (error instanceof AccessError) notFound();
    throw error;
  });
  const therapists = await listTherapists(getDb(), actor.clinicId);
  return (
    <>
      <PageTitle title={`Edit ${record.givenName} ${record.familyName}`} />
      <ClientForm
        action={updateClientAction.bind(null, record.id)}
        initial={record}
        therapists={therapists}
        cancelHref={`/clients/${record.id}`}
        submitLabel="Save changes"
      />
    </>
  );
}
