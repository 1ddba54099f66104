import { requireUser } from "@/app/_lib/page-guard";
import { Fragment, type ReactNode } from "react";
import { ROLES, type Role } from "@/domain/roles";
import { TodayAdmin } from "./_components/today-admin";
import { TodayClerk } from "./_components/today-clerk";
import { TodayFuser } from "./_components/today-fuser";
import { TodayInspector } from "./_components/today-inspector";

export const dynamic = "force-dynamic";

/** Each role's own group of panels (the roles themselves, not a permission: Today summarises a role's work). */
const PANELS: Record<Role, (p: { userId: number; crewId: number | null; now: Date }) => ReactNode> = {
  fuser: ({ userId, crewId, now }) => <TodayFuser userId={userId} crewId={crewId} now={now} />,
  inspector: () => <TodayInspector />,
  clerk: ({ userId }) => <TodayClerk userId={userId} />,
  admin: ({ now }) => <TodayAdmin now={now} />,
};

// Today: what needs this person now, one group of panels per role they hold.
export default async function TodayPage() {
  const user = await requireUser();
  const now = new Date();
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Today</h1>
      <p>Signed in as {user.name}.</p>
      <div className="grid gap-4 md:grid-cols-2">
        {ROLES.filter((role) => user.roles.includes(role)).map((role) => (
          <Fragment key={role}>{PANELS[role]({ userId: user.id, crewId: user.crewId, now })}</Fragment>
        ))}
      </div>
    </div>
  );
}
