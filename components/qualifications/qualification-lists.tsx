// The two ways a qualification overview is listed: by person (who, for which procedure,
// linked to their crew page) and for one person (each procedure with the reason).
import type { ReactNode } from "react";
import Link from "next/link";
import type { QualificationStatus } from "@/domain/qualifications/status";
import { QualificationBadge } from "./qualification-badge";

/** One person's state for one procedure, as the qualification overview lists it. */
type StatusRow = { userId: number; userName: string; procedureId: number; procedureCode: string; status: QualificationStatus };

/** People with their procedure and state, each name linked to the person's page; `empty` when none. */
export function QualifiedPeopleList({ rows, empty }: { rows: StatusRow[]; empty: ReactNode }) {
  if (!rows.length) return <p>{empty}</p>;
  return (
    <ul className="flex flex-col gap-1">
      {rows.map((s) => (
        <li key={`${s.userId}-${s.procedureId}`}>
          <Link className="font-semibold text-brand underline" href={`/crew/${s.userId}`}>
            {s.userName}
          </Link>{" "}
          · {s.procedureCode} · <QualificationBadge status={s.status} />
        </li>
      ))}
    </ul>
  );
}

/** One person's state for each procedure, with the reason in words; `empty` when none. */
export function QualificationStatusList({ statuses, empty }: { statuses: StatusRow[]; empty: ReactNode }) {
  if (!statuses.length) return <p>{empty}</p>;
  return (
    <ul className="flex flex-col gap-2">
      {statuses.map((s) => (
        <li key={s.procedureId}>
          <span className="font-semibold">{s.procedureCode}</span>: <QualificationBadge status={s.status} />
          <div className="text-sm text-slate-700">{s.status.reason}.</div>
        </li>
      ))}
    </ul>
  );
}
