import { notFound } from "next/navigation";
import { ClientTable } from "@/components/clients/client-table";
import { ButtonLink } from "@/components/ui/button";
import { PageTitle } from "@/components/ui/card";
import { currentActor } from "@/lib/auth/guard";

export const metadata = { title: "Clients" };

export default async function ClientsPage() {
  const actor = await currentActor();
  if (!actor || actor.role === "client") notFound();
  return (
    <>
      <PageTitle
        title="Clients"
        subtitle="Everyone your clinic is seeing. Select a name to open the record."
        action={actor.role === "admin" ? null : <ButtonLink href="/clients/new">Add a client</ButtonLink>}
      />
      <ClientTable />
    </>
  );
}
