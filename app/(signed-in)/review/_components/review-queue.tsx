"use client";
import Link from "next/link";
import { useEffect, useMemo, useRef, useState } from "react";
import useSWR from "swr";
import useSWRInfinite from "swr/infinite";
import type { QueueItemView } from "@/app/_server/review/queue-item-view";
import type { QueuePageView } from "@/app/_server/review/queue-page";
import type { BatchAcceptResult } from "@/app/_server/review/accept-batch";
import { FieldShell } from "@/components/form/field-shell";
import { TextAreaField } from "@/components/form/controls";
import { Button } from "@/components/ui/button";
import { OutcomeBadge } from "@/components/ui/badges";
import { TimeDisplay } from "@/components/ui/time-display";
import { REVIEW_STATE_LABELS, type ReviewState } from "@/domain/joints/review-states";
import { BATCH_SKIP_LABELS, MAX_BATCH_ACCEPT } from "@/domain/review/schemas";
import type { UnitSystem } from "@/domain/units/format";
import { acceptBatchAction } from "../actions";
import { JointDetail } from "./joint-detail";

type Option = { id: number | string; label: string };
const FILTER_KEYS = ["job", "fuser", "machine", "outcome", "finding", "waiting", "from", "to", "order"] as const;
export type QueueFilterText = Record<(typeof FILTER_KEYS)[number], string>;

/** Where a link to `/review?joint=N` lands (the page works it out on the server). */
export type Landing =
  | { kind: "pending"; item: QueueItemView }
  | { kind: "decided"; jointId: number; label: string; reviewState: ReviewState; byName: string | null; at: string | null }
  | { kind: "unknown"; jointId: number };

/** Polling interval of the queue, ms: new joints from the trench appear within this. */
const REFRESH_MS = 4000;
const WAITING_CHOICES = [1, 2, 7, 14, 30];
/** The width from which the queue and the joint sit side by side (Tailwind's lg). */
const SIDE_BY_SIDE = "(min-width: 1024px)";

async function fetchJson<T>(url: string): Promise<T> {
  const response = await fetch(url, { headers: { accept: "application/json" } });
  if (!response.ok) {
    const body = (await response.json().catch(() => null)) as { error?: { message?: string } } | null;
    throw new Error(body?.error?.message ?? `The queue could not be loaded (${response.status}).`);
  }
  return (await response.json()) as T;
}

function queryOf(filter: QueueFilterText): string {
  const params = new URLSearchParams();
  for (const k of FILTER_KEYS) if (filter[k] && !(k === "order" && filter[k] === "oldest")) params.set(k, filter[k]);
  return params.toString();
}

export function ReviewQueue({
  initial,
  initialFilter,
  options,
  unitSystem,
  userId,
  landing,
}: {
  initial: QueuePageView;
  initialFilter: QueueFilterText;
  options: { jobs: Option[]; fusers: Option[]; machines: Option[]; findings: Option[] };
  unitSystem: UnitSystem;
  userId: number;
  landing: Landing | null;
}) {
  const [filter, setFilter] = useState<QueueFilterText>(initialFilter);
  const [filtersShown, setFiltersShown] = useState(false);
  const filtersSet = FILTER_KEYS.filter((k) => k !== "order" && filter[k]).length;
  const [selected, setSelected] = useState<number | null>(landing?.kind === "pending" ? landing.item.jointId : null);
  const [landed, setLanded] = useState<Landing | null>(landing);
  const [notice, setNotice] = useState<string | null>(null);
  const [ticked, setTicked] = useState<Map<number, number>>(new Map());
  const [batchNote, setBatchNote] = useState("");
  const [batchBusy, setBatchBusy] = useState(false);
  const [batchResult, setBatchResult] = useState<BatchAcceptResult | null>(null);
  const [batchError, setBatchError] = useState<string | null>(null);
  const [confirmAll, setConfirmAll] = useState(false);
  const detailRef = useRef<HTMLElement>(null);
  const queueRef = useRef<HTMLElement>(null);
  const moveFocus = useRef(landing?.kind === "pending" || landing?.kind === "decided" || landing?.kind === "unknown");

  const query = queryOf(filter);
  const base = `/api/v1/review/queue${query ? `?${query}` : ""}`;
  const { data, error, size, setSize, mutate, isValidating } = useSWRInfinite<QueuePageView>(
    (index, previous: QueuePageView | null) => (index === 0 ? base : previous?.next ? `${base}${query ? "&" : "?"}after=${encodeURIComponent(previous.next)}` : null),
    fetchJson,
    { refreshInterval: REFRESH_MS, fallbackData: query === queryOf(initialFilter) ? [initial] : undefined, revalidateFirstPage: true, revalidateOnFocus: true },
  );
  const first = data?.[0];
  const items = useMemo(() => {
    const seen = new Set<number>();
    return (data ?? []).flatMap((p) => p.items).filter((i) => (seen.has(i.jointId) ? false : (seen.add(i.jointId), true)));
  }, [data]);
  const last = data?.[data.length - 1];
  const hasMore = Boolean(last?.next);
  const loadingMore = size > (data?.length ?? 0);

  // The opened joint: from the loaded pages, or fetched on its own (a link to a joint past the loaded pages).
  const inList = items.find((i) => i.jointId === selected) ?? null;
  const { data: single, mutate: mutateSingle } = useSWR<{ item: QueueItemView }>(
    selected && !inList ? `/api/v1/review/joints/${selected}` : null,
    fetchJson,
    { fallbackData: landing?.kind === "pending" && landing.item.jointId === selected ? { item: landing.item } : undefined, refreshInterval: REFRESH_MS },
  );
  const current = inList ?? (single?.item && single.item.jointId === selected && single.item.reviewState === "pending-review" ? single.item : null);

  useEffect(() => {
    const params = new URLSearchParams(query);
    const joint = selected ?? (landed && landed.kind !== "pending" ? landed.jointId : null);
    if (joint) params.set("joint", String(joint));
    const search = params.toString();
    window.history.replaceState(null, "", `/review${search ? `?${search}` : ""}`);
  }, [query, selected, landed]);

  // Opening a joint shows it at once: on a narrow screen the joint sits under the queue, so it is scrolled to and focused.
  useEffect(() => {
    if (!moveFocus.current) return;
    const target = detailRef.current;
    if (!target) return;
    moveFocus.current = false;
    if (!window.matchMedia(SIDE_BY_SIDE).matches) target.scrollIntoView({ block: "start" });
    target.focus({ preventScroll: true });
  }, [selected, current, landed]);

  const open = (jointId: number) => {
    setNotice(null);
    setLanded(null);
    moveFocus.current = true;
    setSelected(jointId);
  };
  const backToQueue = () => {
    const row = selected ? document.getElementById(`queue-item-${selected}`) : null;
    (row ?? queueRef.current)?.scrollIntoView({ block: "start" });
    row?.querySelector<HTMLButtonElement>("button")?.focus({ preventScroll: true });
  };

  const setField = (name: keyof QueueFilterText, value: string) => {
    setFilter((f) => ({ ...f, [name]: value }));
    setTicked(new Map());
    setBatchResult(null);
    setConfirmAll(false);
  };

  const facets = first?.facets ?? null;
  const counted = (facet: keyof NonNullable<QueuePageView["facets"]>, id: string | number) => (facets ? ` (${facets[facet][String(id)] ?? 0})` : "");
  const select = (name: "job" | "fuser" | "machine" | "finding" | "outcome", label: string, list: Option[]) => (
    <FieldShell id={`filter-${name}`} label={label}>
      {(control) => (
        <select {...control} value={filter[name]} onChange={(e) => setField(name, e.target.value)} className="min-h-touch w-full min-w-0 rounded-md border-2 border-slate-400 bg-white px-2">
          <option value="">Any</option>
          {list.map((o) => (
            <option key={o.id} value={String(o.id)}>
              {o.label}
              {counted(name, o.id)}
            </option>
          ))}
        </select>
      )}
    </FieldShell>
  );

  const eligible = (item: QueueItemView) => item.outcome === "within-limits" && item.fuserId !== userId;
  const shownEligible = items.filter(eligible);
  const withinMatching = first ? first.total - first.outOfLimits : 0;
  const toggle = (item: QueueItemView, on: boolean) =>
    setTicked((t) => {
      const next = new Map(t);
      if (on) next.set(item.jointId, item.revisionNo);
      else next.delete(item.jointId);
      return next;
    });

  const runBatch = async (mode: "ticked" | "matching") => {
    setBatchBusy(true);
    setConfirmAll(false);
    setBatchError(null);
    setBatchResult(null);
    setNotice(null);
    const matching = Object.fromEntries(FILTER_KEYS.filter((k) => k !== "order" && filter[k]).map((k) => [k, filter[k]]));
    const result = await acceptBatchAction(
      mode === "ticked" ? { note: batchNote, joints: [...ticked].map(([jointId, expectedRevisionNo]) => ({ jointId, expectedRevisionNo })) } : { note: batchNote, matching },
    ).catch(() => null);
    setBatchBusy(false);
    if (!result) {
      setBatchError("The batch could not be sent; check the connection and try again.");
      return;
    }
    if (!result.ok) {
      setBatchError(result.message);
      return;
    }
    setBatchResult(result.data);
    setTicked(new Map());
    if (selected && result.data.accepted.some((a) => a.jointId === selected)) setSelected(null);
    await mutate();
  };

  return (
    <div className="grid min-w-0 gap-4 lg:grid-cols-[minmax(0,2fr)_minmax(0,3fr)]">
      <section ref={queueRef} aria-labelledby="queue-heading" className="flex min-w-0 flex-col gap-3">
        <h2 id="queue-heading" className="text-xl font-bold">
          Review queue
        </h2>
        {/* On a phone the filters fold away behind one button, so the queue starts on the first screen. */}
        <Button type="button" variant="secondary" className="sm:hidden" aria-expanded={filtersShown} aria-controls="queue-filters" onClick={() => setFiltersShown((v) => !v)}>
          {filtersShown ? "Hide filters" : "Filters"}
          {filtersSet ? ` (${filtersSet} set)` : ""}
        </Button>
        <form id="queue-filters" role="search" aria-label="Filter the queue" className={`${filtersShown ? "grid" : "hidden"} grid-cols-1 gap-2 sm:grid sm:grid-cols-2`} onSubmit={(e) => e.preventDefault()}>
          {select("job", "Job", options.jobs)}
          {select("fuser", "Fuser", options.fusers)}
          {select("machine", "Machine", options.machines)}
          {select("outcome", "Outcome", [
            { id: "out-of-limits", label: "Out of limits" },
            { id: "within-limits", label: "Within limits" },
          ])}
          {select("finding", "Finding", options.findings)}
          <FieldShell id="filter-waiting" label="Waiting more than">
            {(control) => (
              <select {...control} value={filter.waiting} onChange={(e) => setField("waiting", e.target.value)} className="min-h-touch w-full min-w-0 rounded-md border-2 border-slate-400 bg-white px-2">
                <option value="">Any time</option>
                {WAITING_CHOICES.map((d) => (
                  <option key={d} value={String(d)}>
                    {d} {d === 1 ? "day" : "days"}
                  </option>
                ))}
              </select>
            )}
          </FieldShell>
          <FieldShell id="filter-from" label="Made from">
            {(control) => <input {...control} type="date" value={filter.from} onChange={(e) => setField("from", e.target.value)} className="min-h-touch w-full min-w-0 rounded-md border-2 border-slate-400 bg-white px-2" />}
          </FieldShell>
          <FieldShell id="filter-to" label="Made to">
            {(control) => <input {...control} type="date" value={filter.to} onChange={(e) => setField("to", e.target.value)} className="min-h-touch w-full min-w-0 rounded-md border-2 border-slate-400 bg-white px-2" />}
          </FieldShell>
          <FieldShell id="filter-order" label="Order">
            {(control) => (
              <select {...control} value={filter.order || "oldest"} onChange={(e) => setField("order", e.target.value)} className="min-h-touch w-full min-w-0 rounded-md border-2 border-slate-400 bg-white px-2">
                <option value="oldest">Oldest first</option>
                <option value="out-of-limits-first">Out of limits first</option>
              </select>
            )}
          </FieldShell>
          {query && query !== "" ? (
            <div className="flex items-end">
              <Button type="button" variant="secondary" onClick={() => FILTER_KEYS.forEach((k) => setField(k, k === "order" ? "oldest" : ""))}>
                Clear filters
              </Button>
            </div>
          ) : null}
        </form>
        <p role="status" aria-live="polite" className="text-sm">
          {first ? (
            <>
              <strong>{first.total}</strong> {first.total === 1 ? "joint" : "joints"} waiting, <strong>{first.outOfLimits}</strong> out of limits
              {items.length < first.total ? ` (showing ${items.length})` : ""}
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
        <section aria-label="Accept joints within limits together" className="flex flex-col gap-2 rounded-md border-2 border-slate-300 bg-white p-3">
          <h3 className="font-bold">Accept within-limits joints together</h3>
          <p className="text-sm text-slate-700">
            Tick joints within limits, or accept every joint within limits that matches the filter (at most {MAX_BATCH_ACCEPT} at once). Joints out of limits and your own joints are never
            accepted this way; each joint gets its own revision.
          </p>
          <TextAreaField id="batch-note" label="Note for every joint accepted" hint="Optional for joints within limits." value={batchNote} onChange={(e) => setBatchNote(e.target.value)} />
          <div className="flex flex-wrap gap-2">
            <Button type="button" variant="secondary" disabled={shownEligible.length === 0 || batchBusy} onClick={() => setTicked(new Map(shownEligible.slice(0, MAX_BATCH_ACCEPT).map((i) => [i.jointId, i.revisionNo])))}>
              Tick all shown within limits
            </Button>
            <Button type="button" disabled={ticked.size === 0 || batchBusy} onClick={() => runBatch("ticked")}>
              {batchBusy ? "Accepting…" : `Accept ${ticked.size} ticked`}
            </Button>
            <Button type="button" variant="secondary" disabled={withinMatching === 0 || batchBusy} onClick={() => setConfirmAll(true)}>
              Accept all {withinMatching} within limits matching the filter
            </Button>
          </div>
          {confirmAll ? (
            <div role="group" aria-label="Confirm accepting all matching" className="flex flex-col gap-2 rounded-md border-2 border-brand bg-brand-light p-2">
              <p className="text-sm font-semibold">
                Accept every joint within limits that matches the filter ({withinMatching} now, counted again by the server when you confirm)? Each gets the note above.
              </p>
              <div className="flex flex-wrap gap-2">
                <Button type="button" disabled={batchBusy} onClick={() => runBatch("matching")}>
                  Yes, accept them
                </Button>
                <Button type="button" variant="secondary" onClick={() => setConfirmAll(false)}>
                  Cancel
                </Button>
              </div>
            </div>
          ) : null}
          {ticked.size > MAX_BATCH_ACCEPT ? <p className="text-sm font-semibold text-fail">At most {MAX_BATCH_ACCEPT} joints can be accepted at once; untick some.</p> : null}
          {batchError ? (
            <p role="alert" className="rounded-md border-2 border-fail bg-fail-light p-2 font-semibold text-fail">
              {batchError}
            </p>
          ) : null}
          {batchResult ? (
            <div role="status" aria-label="Batch result" className="rounded-md border-2 border-pass bg-pass-light p-2 text-sm">
              <p className="font-semibold">
                {batchResult.accepted.length} {batchResult.accepted.length === 1 ? "joint" : "joints"} accepted.
                {batchResult.outOfLimitsLeftOut ? ` ${batchResult.outOfLimitsLeftOut} out of limits left for a decision of their own.` : ""}
              </p>
              {batchResult.skipped.length ? (
                <>
                  <p className="mt-1 font-semibold">Skipped:</p>
                  <ul aria-label="Skipped joints" className="list-disc pl-5">
                    {batchResult.skipped.map((s) => (
                      <li key={s.jointId}>
                        {s.label ?? `Joint ${s.jointId}`}: {BATCH_SKIP_LABELS[s.reason]}
                      </li>
                    ))}
                  </ul>
                </>
              ) : null}
            </div>
          ) : null}
        </section>
        {first && items.length === 0 ? <p className="rounded-md border-2 border-pass bg-pass-light p-3 font-semibold text-pass">No joints are waiting for review{query ? " with this filter" : ""}.</p> : null}
        <ul aria-label="Joints waiting for review" className="flex flex-col gap-2">
          {items.map((item) => {
            const label = `${item.jobCode} joint ${item.jointNo}`;
            const canTick = eligible(item);
            return (
              <li key={item.jointId} id={`queue-item-${item.jointId}`}>
                <article aria-label={label} className={`min-w-0 rounded-md border-2 p-3 ${item.jointId === selected ? "border-brand bg-brand-light" : "border-slate-300 bg-white"}`}>
                  <div className="flex flex-wrap items-baseline justify-between gap-2">
                    <h3 className="font-bold">{label}</h3>
                    <OutcomeBadge outcome={item.outcome} />
                  </div>
                  <p className="text-sm break-words text-slate-700">
                    <TimeDisplay at={item.madeAt} /> · {item.fuserName} · {item.machineTag}
                    {item.station ? ` · station ${item.station}` : ""}
                    {item.trace ? " · pressure trace attached" : ""}
                    {item.photos.length ? ` · ${item.photos.length} ${item.photos.length === 1 ? "photo" : "photos"}` : ""}
                  </p>
                  {item.findings.length ? (
                    <ul className="mt-1 list-disc pl-5 text-sm break-words">
                      {item.findings.map((f, i) => (
                        <li key={i}>{f.message}</li>
                      ))}
                    </ul>
                  ) : (
                    <p className="mt-1 text-sm">All recorded values within the plan.</p>
                  )}
                  <div className="mt-2 flex flex-wrap items-center gap-3">
                    <button
                      type="button"
                      onClick={() => open(item.jointId)}
                      className="min-h-touch rounded-md border-2 border-brand px-3 font-semibold text-brand hover:bg-brand-light"
                      aria-label={`Open ${label}`}
                    >
                      Open
                    </button>
                    {canTick ? (
                      <label className="flex min-h-touch items-center gap-2">
                        <input type="checkbox" className="h-5 w-5" checked={ticked.has(item.jointId)} onChange={(e) => toggle(item, e.target.checked)} aria-label={`Tick ${label} to accept`} />
                        <span className="text-sm">Tick to accept</span>
                      </label>
                    ) : (
                      <span className="text-sm text-slate-700">{item.fuserId === userId ? "Your own joint" : "Decide on its own"}</span>
                    )}
                  </div>
                </article>
              </li>
            );
          })}
        </ul>
        {hasMore || loadingMore ? (
          <Button type="button" variant="secondary" disabled={loadingMore} onClick={() => setSize(size + 1)}>
            {loadingMore ? "Loading more joints…" : `Show more joints (${first ? first.total - items.length : ""} more)`}
          </Button>
        ) : null}
      </section>
      <section
        ref={detailRef}
        tabIndex={-1}
        aria-label="Selected joint"
        className="min-w-0 scroll-mt-2 focus:outline-none lg:sticky lg:top-2 lg:max-h-[calc(100vh-1rem)] lg:self-start lg:overflow-y-auto"
      >
        {current || landed?.kind === "decided" || landed?.kind === "unknown" ? (
          <div className="mb-2 lg:hidden">
            <Button type="button" variant="ghost" onClick={backToQueue}>
              Back to the queue
            </Button>
          </div>
        ) : null}
        {current ? (
          <div className="min-w-0 overflow-x-auto">
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
                await Promise.all([mutate(), mutateSingle()]);
              }}
            />
          </div>
        ) : landed?.kind === "decided" ? (
          <div role="status" className="rounded-md border-2 border-slate-300 bg-white p-4">
            <h2 className="text-xl font-bold">{landed.label}</h2>
            <p className="mt-2">
              {landed.label} is no longer waiting for review: {REVIEW_STATE_LABELS[landed.reviewState].toLowerCase()}
              {landed.byName ? ` by ${landed.byName}` : ""}
              {landed.at ? (
                <>
                  {" "}
                  on <TimeDisplay at={landed.at} />
                </>
              ) : null}
              .
            </p>
            <p className="mt-2">
              <Link href={`/joints/${landed.jointId}`} className="font-semibold text-brand underline">
                See {landed.label} and its history
              </Link>
            </p>
          </div>
        ) : landed?.kind === "unknown" ? (
          <p role="status" className="rounded-md border-2 border-slate-300 bg-white p-4">
            There is no joint {landed.jointId}. Check the number in the link.
          </p>
        ) : selected && single?.item && single.item.reviewState !== "pending-review" ? (
          <p className="rounded-md border-2 border-dashed border-slate-300 p-6 text-slate-700">
            {single.item.jobCode} joint {single.item.jointNo} was {REVIEW_STATE_LABELS[single.item.reviewState].toLowerCase()} meanwhile.{" "}
            <Link href={`/joints/${single.item.jointId}`} className="font-semibold text-brand underline">
              See the joint
            </Link>
          </p>
        ) : (
          <p className="rounded-md border-2 border-dashed border-slate-300 p-6 text-slate-700">{selected ? "Loading the joint…" : "Open a joint from the queue to see its evidence and decide it."}</p>
        )}
      </section>
    </div>
  );
}
