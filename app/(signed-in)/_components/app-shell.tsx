import Link from "next/link";
import type { Screen } from "@/domain/roles";
import { can, ROLE_LABELS, type Role } from "@/domain/roles";
import { signOutAction } from "@/app/(signed-out)/sign-in/actions";
import { OfflineSupport } from "@/components/offline/offline-support";
import { SignOutButton } from "@/components/offline/sign-out-button";
import { UnitToggle } from "./unit-toggle";
import type { UnitSystem } from "@/domain/units/format";

/** The responsive shell: a top bar with the person and a navigation of their screens. */
export function AppShell({ user, screens, timeZone, children }: { user: { id: number; name: string; roles: Role[]; unitSystem: UnitSystem }; screens: Screen[]; timeZone: string; children: React.ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <OfflineSupport userId={user.id} keepsTrench={can(user, "recordJoint")} />
      <header className="no-print bg-brand text-white">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center justify-between gap-2 px-4 py-2">
          <Link href="/" className="flex min-h-touch items-center text-xl font-bold">
            Beadline
          </Link>
          <div className="flex flex-wrap items-center gap-3 text-sm">
            <span>
              <span className="font-semibold">{user.name}</span> · {user.roles.map((r) => ROLE_LABELS[r]).join(", ")}
            </span>
            <span>Times in {timeZone}</span>
            <UnitToggle unitSystem={user.unitSystem} />
            <SignOutButton userId={user.id} signOut={signOutAction} />
          </div>
        </div>
        <nav aria-label="Screens" className="bg-brand-dark">
          <ul className="mx-auto flex max-w-7xl gap-1 overflow-x-auto px-2">
            {screens.map((s) => (
              <li key={s.id}>
                <Link href={s.href} className="flex min-h-touch items-center whitespace-nowrap px-3 font-semibold hover:bg-brand">
                  {s.label}
                </Link>
              </li>
            ))}
          </ul>
        </nav>
      </header>
      <main className="mx-auto w-full max-w-7xl flex-1 p-4">{children}</main>
    </div>
  );
}
