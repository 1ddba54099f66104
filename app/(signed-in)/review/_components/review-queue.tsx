"use client";
import { useEffect, useMemo, useState } from "react";
import useSWR from "swr";
import type { QueueItemView } from "@/app/_server/review/queue-item-view";
import { FieldShell } from "@/components/form/field-shell";
import { OutcomeBadge } from "@/components/ui/badges";
import { TimeDisplay } from "@/components/ui/time-display";
import { JointDetail } from "./joint-detail";
import type { UnitSystem } from "@/domain/units/format";

type Queue = { total: number; outOfLimits: number; items: QueueItemView[] };
type Option = { id: number | string; label: string };
type Filter = { job: string; fuser: string; machine: string; finding: string };

/** Polling interval of the queue, ms: new joints from the trench appear within this. */
const REFRESH_MS = 4000;

async function fetchQueue(url: string): Promise<Queue> {
  const response = await fetch(url, { headers: { accept: "application/json" } });
  if (!response.ok) {
    const body = (await response.json().catch(() => null)) as { error?: { message?: string } } | null;
    throw new Error(body?.error?.message ?? `The queue could not be loaded (${response.status}).`);
  }
  return (await response.json()) as Queue;
}

function queryOf(filter: Filter): string {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(filter)) if (v) params.set(k, v);
  return params.toString();
}

export function ReviewQueue({
  initial,
  initialFilter,
  options,
  unitSystem,
  userId,
  initialSelected,
}: {
  initial: Queue;
  initialFilter: Filter;
  options: { jobs: Option[]; fusers: Option[]; machines: Option[]; findings: Option[] };
  unitSystem: UnitSystem;
  userId: number;
  initialSelected: number | null;
}) {
  const [filter, setFilter] = useState<Filter>(initialFilter);
  const [selected, setSelected] = useState<number | null>(initialSelected);
  const [notice, setNotice] = useState<string | null>(null);
  const query = queryOf(filter);
  const key = `/api/v1/review/queue${query ? `?${query}` : ""}`;
  const { data, error, mutate, isValidating } = useSWR<Queue>(key, fetchQueue, {
    refreshInterval: REFRESH_MS,
    fallbackData: query === queryOf(initialFilter) ? initial : undefined,
    keepPreviousData: true,
    revalidateOnFocus: true,
  });

  useEffect(() => {
    const params = new URLSearchParams(query);
    if (selected) params.set("joint", String(selected));
    const search = params.toString();
    window.history.replaceState(null, "", `/review${search ? `?${search}` : ""}`);
  }, [query, selected]);

  const items = useMemo(() => data?.items ?? [], [data]);
  const current = items.find((i) => i.jointId === selected) ?? null;

  const select = (name: keyof Filter, label: string, list: Option[]) => (
    <FieldShell id={`filter-${name}`} label={label}>
      {(control) => (
        <select {...control} value={filter[name]} onChange={(e) => setFilter((f) => ({ ...f, [name]: e.target.value }))} className="min-h-touch rounded-md border-2 border-slate-400 bg-white px-2">
          <option value="">Any</option>
          {list.map((o) => (
            <option key={o.id} value={String(o.id)}>
              {o.label}
            </option>
          ))}
        </select>
      )}
    </FieldShell>
  );

  return (
    <div className="grid gap-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
      <section aria-labelledby="queue-heading" className="flex flex-col gap-3">
        <h2 id="queue-heading" className="text-xl font-bold">
          Review queue
        </h2>
        <form role="search" aria-label="Filter the queue" className="grid grid-cols-2 gap-2" onSubmit={(e) => e.preventDefault()}>
          {select("job", "Job", options.jobs)}
          {select("fuser", "Fuser", options.fusers)}
          {select("machine", "Machine", options.machines)}
          {select("finding", "Finding", options.findings)}
        </form>
        <p role="status" aria-live="polite" className="text-sm">
          {data ? (
            <>
              <strong>{data.total}</strong> {data.total === 1 ? "joint" : "joints"} waiting, <strong>{data.outOfLimits}</strong> out of limits
              {data.items.length < data.total ? ` (showing the first ${data.items.length})` : ""}
              {isValidating ? " · checking for new joints…" : ""}
            </>
          ) : (
            "Loading…"
          )}
        </p>
        {error ? (
          <p role="alert" className="rounded-md border-2 border-fail bg-fail-light p-2 font-semibold text-fail">
            {error.message} The list shows what was last loaded.
          </p>
        ) : null}
        {notice ? (
          <p role="status" className="rounded-md border-2 border-pass bg-pass-light p-2 font-semibold text-pass">
            {notice}
          </p>
        ) : null}
        {data && items.length === 0 ? <p className="rounded-md border-2 border-pass bg-pass-light p-3 font-semibold text-pass">No joints are waiting for review{query ? " with this filter" : ""}.</p> : null}
        <ul aria-label="Joints waiting for review" className="flex flex-col gap-2">
          {items.map((item) => {
            const label = `${item.jobCode} joint ${item.jointNo}`;
            return (
              <li key={item.jointId}>
                <article aria-label={label} className={`rounded-md border-2 p-3 ${item.jointId === selected ? "border-brand bg-brand-light" : "border-slate-300 bg-white"}`}>
                  <div className="flex flex-wrap items-baseline justify-between gap-2">
                    <h3 className="font-bold">{label}</h3>
                    <OutcomeBadge outcome={item.outcome} />
                  </div>
                  <p className="text-sm text-slate-700">
                    <TimeDisplay at={item.madeAt} /> · {item.fuserName} · {item.machineTag}
                    {item.station ? ` · station ${item.station}` : ""}
                    {item.trace ? " · pressure trace attached" : ""}
                    {item.photos.length ? ` · ${item.photos.length} ${item.photos.length === 1 ? "photo" : "photos"}` : ""}
                  </p>
                  {item.findings.length ? (
                    <ul className="mt-1 list-disc pl-5 text-sm">
                      {item.findings.map((f, i) => (
                        <li key={i}>{f.message}</li>
                      ))}
                    </ul>
                  ) : (
                    <p className="mt-1 text-sm">All recorded values within the plan.</p>
                  )}
                  <button
                    type="button"
                    onClick={() => {
                      setNotice(null);
                      setSelected(item.jointId);
                    }}
                    className="mt-2 min-h-touch rounded-md border-2 border-brand px-3 font-semibold text-brand hover:bg-brand-light"
                    aria-label={`Open ${label}`}
                  >
                    Open
                  </button>
                </article>
              </li>
            );
          })}
        </ul>
      </section>
      <section aria-label="Selected joint" className="lg:sticky lg:top-2 lg:max-h-[calc(100vh-1rem)] lg:self-start lg:overflow-y-auto">
        {current ? (
          <JointDetail
            key={`${current.jointId}-${current.revisionNo}`}
            item={current}
            unitSystem={unitSystem}
            isOwnJoint={current.fuserId === userId}
            onDecided={async (message) => {
              setNotice(message);
              setSelected(null);
              await mutate();
            }}
            onChanged={async () => {
              await mutate();
            }}
          />
        ) : (
          <p className="rounded-md border-2 border-dashed border-slate-300 p-6 text-slate-700">{selected ? "That joint is no longer waiting for review." : "Open a joint from the queue to see its evidence and decide it."}</p>
        )}
      </section>
    </div>
  );
}
