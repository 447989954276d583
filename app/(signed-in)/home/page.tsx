import { redirect } from "next/navigation";
import { AdminHome } from "@/components/home/admin-home";
import { ClientHome } from "@/components/home/client-home";
import { ClinicianHome } from "@/components/home/clinician-home";
import { currentActor } from "@/lib/auth/guard";

export const metadata = { title: "Home" };

export default async function HomePage() {
  const actor = await currentActor();
  if (!actor) redirect("/sign-in");
  switch (actor.role) {
    case "admin":
      return <AdminHome actor={actor} />;
    case "client":
      return <ClientHome actor={actor} />;
    default:
      return <ClinicianHome actor={actor} />;
  }
}
