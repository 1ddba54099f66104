import { requireUser } from "@/app/_lib/page-guard";
import { hasAnyRole } from "@/domain/roles";
import { TodayAdmin } from "./_components/today-admin";
import { TodayClerk } from "./_components/today-clerk";
import { TodayFuser } from "./_components/today-fuser";
import { TodayInspector } from "./_components/today-inspector";

export const dynamic = "force-dynamic";

// Today: what needs this person now, one group of panels per role they hold.
export default async function TodayPage() {
  const user = await requireUser();
  const now = new Date();
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Today</h1>
      <p>Signed in as {user.name}.</p>
      <div className="grid gap-4 md:grid-cols-2">
        {hasAnyRole(user, ["fuser"]) ? <TodayFuser userId={user.id} now={now} /> : null}
        {hasAnyRole(user, ["inspector"]) ? <TodayInspector /> : null}
        {hasAnyRole(user, ["clerk"]) ? <TodayClerk userId={user.id} /> : null}
        {hasAnyRole(user, ["admin"]) ? <TodayAdmin now={now} /> : null}
      </div>
    </div>
  );
}
