import Link from "next/link";
import { screensFor } from "@/domain/roles";
import { requireUser } from "@/app/_lib/page-guard";

// Today: what needs this person now. TODO(issue 4): per-role panels (drafts, queue, coils, lapses).
export default async function TodayPage() {
  const user = await requireUser();
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Today</h1>
      <p>Signed in as {user.name}.</p>
      <ul className="grid gap-2 sm:grid-cols-3">
        {screensFor(user)
          .filter((s) => s.id !== "today")
          .map((s) => (
            <li key={s.id}>
              <Link className="block rounded-md border-2 border-brand bg-white p-4 font-semibold text-brand" href={s.href}>
                {s.label}
              </Link>
            </li>
          ))}
      </ul>
    </div>
  );
}
