import { screensFor } from "@/domain/roles";
import { currentUser } from "@/app/_lib/session";
import { AppShell } from "./_components/app-shell";

// The layout only draws the shell for whoever is signed in; pages and actions guard themselves.
export default async function SignedInLayout({ children }: { children: React.ReactNode }) {
  const user = await currentUser();
  if (!user) return <>{children}</>;
  return (
    <AppShell user={user} screens={screensFor(user)}>
      {children}
    </AppShell>
  );
}
