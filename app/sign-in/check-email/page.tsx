import Link from "next/link";

export const metadata = { title: "Check your e-mail" };

export default function CheckEmailPage() {
  return (
    <main className="mx-auto max-w-md px-5 py-20 text-center">
      <h1 className="text-2xl font-semibold">Check your e-mail</h1>
      <p className="mt-3 text-ink-soft">We sent you a sign-in link. It works once, for the next 15 minutes.</p>
      <Link href="/sign-in" className="mt-6 inline-block text-tide-700 underline">
        Back to sign-in
      </Link>
    </main>
  );
}
