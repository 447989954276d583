import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/guard";

export default async function Root() {
  redirect((await currentActor()) ? "/home" : "/sign-in");
}
