import Link from "next/link";
import type { Role } from "@/db/schema";
import { signOutAction } from "@/app/actions";
import { IdleSignOut } from "@/components/idle-sign-out";
import { KinarcMark } from "@/components/kinarc-mark";
import { env } from "@/lib/env";

const NAV: Record<Role, { href: string; label: string }[]> = {
  therapist: [
    { href: "/home", label: "Today" },
    { href: "/visits", label: "Visits" },
    { href: "/follow-ups", label: "Follow-ups" },
    { href: "/clients", label: "Clients" },
    { href: "/uploads", label: "Clips & documents" },
    { href: "/accuracy", label: "Accuracy" },
  ],
  assistant: [
    { href: "/home", label: "My list" },
    { href: "/visits", label: "Visits" },
    { href: "/follow-ups", label: "Follow-ups" },
    { href: "/clients", label: "Clients" },
    { href: "/uploads", label: "Clips & documents" },
    { href: "/accuracy", label: "Accuracy" },
  ],
  admin: [
    { href: "/home", label: "Overview" },
    { href: "/team", label: "Team" },
    { href: "/visits", label: "Visits" },
    { href: "/clinic", label: "Clinic settings" },
    { href: "/audit", label: "Access trail" },
    { href: "/clients", label: "Clients" },
    { href: "/admin-billing", label: "Billing" },
    { href: "/records", label: "Export & erasure" },
    { href: "/accuracy", label: "Accuracy" },
  ],
  client: [
    { href: "/home", label: "My page" },
    { href: "/practice/check", label: "Self-check" },
    { href: "/uploads", label: "Send a clip" },
    { href: "/pay", label: "Payments" },
  ],
};

const ROLE_NAMES: Record<Role, string> = { admin: "Clinic admin", therapist: "Therapist", assistant: "Therapy assistant", client: "Client" };

export function AppShell({ role, name, clinicName, children }: { role: Role; name: string; clinicName: string; children: React.ReactNode }) {
  return (
    <div className="min-h-screen">
      <header className="border-b border-sand-200 bg-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3">
          <Link href="/home" className="flex items-center gap-2 font-semibold text-tide-900">
            <KinarcMark className="h-8 w-8" />
            <span>Kinarc</span>
          </Link>
          <nav aria-label="Main" className="flex flex-1 flex-wrap gap-1">
            {NAV[role].map((item) => (
              <Link key={item.href} href={item.href} className="rounded-lg px-3 py-1.5 text-sm font-medium text-ink-soft hover:bg-tide-50 hover:text-tide-700">
                {item.label}
              </Link>
            ))}
          </nav>
          <div className="flex items-center gap-3 text-sm">
            <span className="text-right leading-tight">
              <span className="block font-medium" data-testid="signed-in-name">
                {name}
              </span>
              <span className="block text-xs text-ink-faint">
                {ROLE_NAMES[role]} · {clinicName}
              </span>
            </span>
            <form action={signOutAction}>
              <button type="submit" className="rounded-lg px-3 py-1.5 text-sm text-ink-soft ring-1 ring-sand-200 hover:bg-sand-100">
                Sign out
              </button>
            </form>
          </div>
        </div>
      </header>
      <main className="mx-auto max-w-6xl px-4 py-8">{children}</main>
      {role === "client" ? null : <IdleSignOut idleMinutes={env().STAFF_IDLE_MINUTES} />}
    </div>
  );
}
