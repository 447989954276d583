import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { ClientLinkForm, StaffSignInForm } from "@/components/auth/sign-in-forms";
import { KinarcMark } from "@/components/kinarc-mark";
import { currentActor } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Sign in" };

const ERRORS: Record<string, string> = {
  Verification: "That sign-in link has expired or was already used. Ask for a new one below.",
  AccessDenied: "That address cannot sign in here. Ask your clinic to check your e-mail on file.",
};

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ error?: string; welcome?: string }> }) {
  if (await currentActor()) redirect("/home");
  const { error, welcome } = await searchParams;
  const notice = error
    ? { message: ERRORS[error] ?? "Sign-in did not complete. Please try again." }
    : welcome
      ? { ok: true, message: "Password saved. Sign in with it now." }
      : undefined;
  return (
    <main className="mx-auto grid min-h-screen max-w-5xl items-center gap-10 px-5 py-10 md:grid-cols-[1.1fr_1fr]">
      <div>
        <KinarcMark className="h-12 w-12" />
        <h1 className="mt-4 text-3xl font-semibold tracking-tight text-tide-900">Kinarc</h1>
        <p className="mt-3 max-w-md text-ink-soft">
          Wrist and finger checks for hand therapy: measured range of motion on camera, range-based strength grades
          signed by your therapist, and a clear list of what still needs a hands-on test.
        </p>
      </div>
      <div className="space-y-6">
        <section className="rounded-card border border-sand-200 bg-white p-6 shadow-sm">
          <h2 className="text-lg font-semibold">Clinic staff</h2>
          <p className="mb-4 text-sm text-ink-soft">Sign in with your work e-mail and password.</p>
          <StaffSignInForm notice={notice} />
        </section>
        <section className="rounded-card border border-sand-200 bg-tide-50 p-6">
          <h2 className="text-lg font-semibold">Clients</h2>
          <p className="mb-4 text-sm text-ink-soft">No password needed: we e-mail you a link that signs you in.</p>
          <ClientLinkForm />
        </section>
      </div>
    </main>
  );
}
