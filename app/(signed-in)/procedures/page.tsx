import Link from "next/link";
import { requireUser } from "@/app/_lib/page-guard";
import { currentProcedureVersion, listProcedures } from "@/database/queries/procedures";
import { builtInProcedure } from "@/domain/procedures";
import { can } from "@/domain/roles";
import { AddProcedureForm } from "./_components/add-procedure-form";
import { standardOptions } from "./_lib/views";

export const dynamic = "force-dynamic";

// Procedures: the operator's written joining procedures, each based on a published standard.
export default async function ProceduresPage() {
  const user = await requireUser("viewProcedures");
  const procedures = await listProcedures();
  const current = await Promise.all(procedures.map((p) => currentProcedureVersion({ procedureId: p.id })));
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Procedures</h1>
      <p>Each procedure is based on a published standard&apos;s windows and may only tighten them. A version used by any joint is never changed: tightening publishes a new version.</p>
      <ul className="grid gap-3 sm:grid-cols-2">
        {procedures.map((p, i) => (
          <li key={p.id} className="rounded-md border-2 border-slate-300 bg-white p-4">
            <h2 className="text-lg font-bold">
              <Link className="text-brand underline" href={`/procedures/${p.id}`}>
                {p.code}
              </Link>
            </h2>
            <p>{p.name}</p>
            <p className="text-sm text-slate-700">
              Based on {builtInProcedure(p.standard).label}. {current[i] ? `Current version ${current[i]!.versionNo}, published ${current[i]!.publishedAt.toISOString().slice(0, 10)}.` : "No version published."}
              {p.isActive ? "" : " Retired."}
            </p>
          </li>
        ))}
      </ul>
      {can(user, "manageProcedures") ? (
        <section aria-labelledby="add-procedure" className="rounded-md border-2 border-slate-300 bg-white p-4">
          <h2 id="add-procedure" className="mb-2 text-xl font-bold">
            Add a procedure
          </h2>
          <AddProcedureForm standards={standardOptions()} />
        </section>
      ) : null}
    </div>
  );
}
