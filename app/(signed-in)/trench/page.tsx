import type { Metadata } from "next";
import Link from "next/link";
import { requireUser } from "@/app/_lib/page-guard";
import { loadTrenchSetup } from "@/app/_server/trench/load-setup";
import { toTrenchCoil } from "@/app/_server/trench/setup-types";
import { findCoilByCodeOrTrace } from "@/database/queries/coils";
import { TrenchScreen } from "./_components/trench-screen";
import { OfflineFreshness } from "./_components/offline-freshness";
import { OUTCOME_LABELS } from "@/domain/joints/outcomes";

export const metadata: Metadata = { title: "Trench" };
export const dynamic = "force-dynamic";

/** A coil named in the address (`?sideA=LV-C0001`, from a coil page's "Use as side A"). */
async function coilFromAddress(code: string | string[] | undefined, preferCrewId: number | null) {
  const text = typeof code === "string" ? code.trim().slice(0, 200) : "";
  if (!text) return null;
  const coil = await findCoilByCodeOrTrace({ code: text, preferCrewId });
  return coil ? toTrenchCoil(coil) : null;
}

// Trench: a qualified fuser records a joint at the trench, on a phone, through dropped signal.
export default async function TrenchPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("recordJoint");
  const query = await searchParams;
  const [setup, sideA, sideB] = await Promise.all([loadTrenchSetup(user), coilFromAddress(query.sideA, user.crewId), coilFromAddress(query.sideB, user.crewId)]);
  return (
    <div className="mx-auto flex w-full max-w-xl flex-col gap-4">
      <h1 className="text-2xl font-bold">Trench: record a joint</h1>
      <OfflineFreshness loadedAt={setup.loadedAt} />
      <TrenchScreen setup={setup} prefill={sideA || sideB ? { A: sideA, B: sideB } : undefined} />
      {setup.recent.length ? (
        <details className="rounded-md border-2 border-slate-300 bg-white">
          <summary className="flex min-h-12 cursor-pointer items-center px-3 py-2">
            <h2 className="text-xl font-bold">Your latest joints ({setup.recent.length})</h2>
          </summary>
          <ul className="flex flex-col gap-1 border-t-2 border-slate-200 p-3">
            {setup.recent.map((j) => (
              <li key={j.id}>
                <Link href={`/joints/${j.id}`} className="flex min-h-touch items-center justify-between gap-2 rounded-md border-2 border-slate-300 bg-white px-3 font-semibold">
                  <span>
                    {j.jobCode} joint {j.jointNo}
                  </span>
                  <span className={j.outcome === "within-limits" ? "text-pass" : "text-fail"}>{OUTCOME_LABELS[j.outcome]}</span>
                </Link>
              </li>
            ))}
          </ul>
        </details>
      ) : null}
    </div>
  );
}
