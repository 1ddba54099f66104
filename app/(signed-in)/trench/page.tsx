import type { Metadata } from "next";
import Link from "next/link";
import { Cautions } from "@/components/ui/caution";
import { requireUser } from "@/app/_lib/page-guard";
import { loadTrenchSetup } from "@/app/_server/trench/load-setup";
import { TrenchScreen } from "./_components/trench-screen";
import { OfflineFreshness } from "./_components/offline-freshness";
import { OUTCOME_LABELS } from "@/domain/joints/outcomes";

export const metadata: Metadata = { title: "Trench" };
export const dynamic = "force-dynamic";

// Trench: a qualified fuser records a joint at the trench, on a phone, through dropped signal.
export default async function TrenchPage() {
  const user = await requireUser("recordJoint");
  const setup = await loadTrenchSetup(user);
  return (
    <div className="mx-auto flex w-full max-w-xl flex-col gap-4">
      <h1 className="text-2xl font-bold">Trench: record a joint</h1>
      <OfflineFreshness loadedAt={setup.loadedAt} />
      <Cautions />
      <TrenchScreen setup={setup} />
      {setup.recent.length ? (
        <section aria-labelledby="recent-heading" className="flex flex-col gap-2">
          <h2 id="recent-heading" className="text-xl font-bold">
            Your latest joints
          </h2>
          <ul className="flex flex-col gap-1">
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
        </section>
      ) : null}
    </div>
  );
}
