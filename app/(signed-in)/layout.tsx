import { screensFor } from "@/domain/roles";
import { pageUser } from "@/app/_lib/page-guard";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { TimeZoneProvider } from "@/components/ui/time-zone";
import { AppShell } from "./_components/app-shell";

// The layout only draws the shell for whoever is signed in; pages and actions guard themselves.
// It hands the organisation's time zone to every client part of the screens below.
export default async function SignedInLayout({ children }: { children: React.ReactNode }) {
  const user = await pageUser();
  if (!user) return <>{children}</>;
  const timeZone = await organisationTimeZone();
  return (
    <TimeZoneProvider timeZone={timeZone}>
      <AppShell user={user} screens={screensFor(user)} timeZone={timeZone}>
        {children}
      </AppShell>
    </TimeZoneProvider>
  );
}
