"use client";
// "Record joint": a valid form is checked at once against the plan (a preliminary
// result), put in the device's outbox and sent when it can be; the draft starts afresh
// keeping the job, machine and heater. Also the remake of an out-of-limits joint and the
// list of joints this one may replace; before the same two coils are joined again, the
// question whether this is a remake or a mistake.
import { useMemo, useRef, useState, type Dispatch, type SetStateAction } from "react";
import type { FusionPlan } from "@/domain/fusion/plan";
import { pickRecordedValues } from "@/domain/joints/values";
import { entryKey, saveRemembered, type OutboxEntry, type PhotoRef, type Remembered } from "../../_client/device-store";
import { findLocalCoil } from "../../_client/find-coil";
import { loadedFusionTools } from "../../_client/load-fusion-tools";
import { earlierJointOfCoils, whyNotRemakeOf, type CoilPairJoint } from "@/domain/joints/same-coils";
import type { TrenchSetup } from "@/app/_server/trench/setup-types";
import type { useOutbox } from "../../_client/use-outbox";
import type { FormIn, FormOut, SideCoils } from "./use-trench-draft";

interface RecordJointDeps {
  setup: TrenchSetup;
  outbox: ReturnType<typeof useOutbox>;
  jobId: unknown;
  job: TrenchSetup["jobs"][number] | null;
  plan: FusionPlan | null;
  cannotRecord: boolean;
  photos: PhotoRef[];
  coils: SideCoils;
  setCoils: Dispatch<SetStateAction<SideCoils>>;
  startNewDraft: (keep: Remembered, extra?: Partial<FormIn>) => void;
}

/** The question asked before the same two coils are joined again, with the values waiting on the answer. */
export type SameCoilsQuestion = { values: FormOut; earlier: CoilPairJoint; whyNotRemake: string | null };

export function useRecordJoint({ setup, outbox, jobId, job, plan, cannotRecord, photos, coils, setCoils, startNewDraft }: RecordJointDeps) {
  const system = setup.user.unitSystem;
  const userId = setup.user.id;
  const [shownResult, setShownResult] = useState<string | null>(null);
  const [formMessage, setFormMessage] = useState<string | null>(null);
  const resultRef = useRef<HTMLDivElement>(null);

  const remakeOptions = useMemo(() => {
    const fromServer = setup.remakes.filter((r) => r.jobId === jobId).map((r) => ({ id: r.id, text: `Joint ${r.jointNo} (${r.reviewState === "cut-out" ? "cut out" : "out of limits"}${r.coilACode ? `, ${r.coilACode}` : ""})` }));
    const fromDevice = outbox.entries
      .filter((e) => e.result && e.result.outcome === "out-of-limits" && e.result.jobId === jobId && !fromServer.some((f) => f.id === e.result!.id))
      .map((e) => ({ id: e.result!.id, text: `Joint ${e.result!.jointNo} (out of limits, just recorded)` }));
    return [...fromDevice, ...fromServer];
  }, [setup.remakes, outbox.entries, jobId]);

  // Joints already made between two coils: the server's (with the page) and this device's
  // own that the page does not know yet (waiting to be sent, or sent since it loaded).
  const knownPairs = useMemo((): CoilPairJoint[] => {
    const fromDevice = outbox.entries
      .filter((e) => e.state !== "refused" && e.payload.kind === "coil-to-coil" && e.payload.coilB && !setup.pairs.some((p) => p.id === e.result?.id))
      .map((e) => ({
        id: e.result?.id ?? null,
        jointNo: e.result?.jointNo ?? null,
        jobId: Number(e.payload.jobId),
        coilACode: String(e.payload.coilA ?? ""),
        coilBCode: String(e.payload.coilB ?? ""),
        madeAt: e.createdAt,
        outcome: (e.result?.outcome ?? e.preliminary?.outcome ?? null) as CoilPairJoint["outcome"],
        reviewState: null,
        replacedByJointId: null,
      }));
    return [...setup.pairs, ...fromDevice];
  }, [setup.pairs, outbox.entries]);
  const [question, setQuestion] = useState<SameCoilsQuestion | null>(null);

  const onValid = (v: FormOut) => {
    setFormMessage(null);
    if (v.kind === "coil-to-coil") {
      const earlier = earlierJointOfCoils(knownPairs, coils.A?.code ?? String(v.coilA ?? ""), coils.B?.code ?? String(v.coilB ?? ""));
      if (earlier && !(earlier.id !== null && v.replacesJointId === earlier.id)) {
        setQuestion({ values: v, earlier, whyNotRemake: whyNotRemakeOf(earlier, v.jobId) });
        return;
      }
    }
    record(v);
  };

  /** The fuser's answer to the same-coils question. "change" leaves the form as it is for a new coil. */
  const answerSameCoils = (answer: "remake" | "anyway" | "change") => {
    const q = question;
    setQuestion(null);
    if (!q || answer === "change") return;
    if (answer === "remake" && q.earlier.id !== null && !q.whyNotRemake) record({ ...q.values, replacesJointId: q.earlier.id });
    else if (answer === "anyway") record(q.values);
  };

  const record = (v: FormOut) => {
    setFormMessage(null);
    if (cannotRecord) {
      setFormMessage("This joint cannot be recorded yet: see the warnings in Set up.");
      return;
    }
    const madeAt = new Date().toISOString();
    let preliminary: OutboxEntry["preliminary"] = null;
    // A plan exists only once the device's check has loaded (use-fusion-plan-preview).
    const tools = loadedFusionTools();
    if (plan && tools) {
      const check = tools.checkJoint(plan, pickRecordedValues(v), { system, conditions: { ambientC: v.ambientC, shelter: v.shelter } });
      preliminary = { outcome: check.outcome, findings: check.findings.map((f) => f.message) };
    }
    const label = `${v.coilA} + ${v.kind === "coil-to-coil" ? v.coilB : v.componentBText}`;
    const entry: OutboxEntry = {
      // Its own id on this device: a draft recorded in two tabs carries one client id twice.
      localId: crypto.randomUUID(),
      clientId: v.clientId,
      createdAt: madeAt,
      jobCode: job?.code ?? `job ${v.jobId}`,
      label,
      payload: { ...v, madeAt },
      photos,
      state: "waiting",
      attempts: 0,
      lastTriedAt: null,
      message: navigator.onLine ? "Sending …" : "No signal: waiting to send. It goes as soon as the connection is back.",
      preliminary,
    };
    outbox.enqueue(entry);
    const keep = { jobId: v.jobId, machineId: v.machineId, heaterId: v.heaterId };
    saveRemembered(userId, keep);
    setShownResult(entryKey(entry));
    setCoils({ A: null, B: null });
    startNewDraft(keep);
    window.setTimeout(() => resultRef.current?.scrollIntoView({ behavior: "smooth", block: "start" }), 50);
  };

  const onInvalid = () => setFormMessage("Some values are missing or not valid: see the fields marked in red.");

  const remake = (entry: OutboxEntry) => {
    const p = entry.payload;
    const keep = { jobId: p.jobId as number, machineId: p.machineId as number, heaterId: p.heaterId as number };
    const a = findLocalCoil(setup.coils, String(p.coilA ?? ""), setup.user.crewId);
    const b = p.coilB ? findLocalCoil(setup.coils, String(p.coilB), setup.user.crewId) : null;
    startNewDraft(keep, { kind: p.kind as FormIn["kind"], coilA: String(p.coilA ?? ""), coilB: (p.coilB as string | null) ?? "", componentBText: (p.componentBText as string | null) ?? "", replacesJointId: entry.result!.id, station: (p.station as string | null) ?? "" });
    setCoils({ A: a, B: b });
    setShownResult(null);
    setFormMessage(`Recording the remake of joint ${entry.result!.jointNo}: it will link to the joint it replaces.`);
    window.scrollTo({ top: 0, behavior: "smooth" });
  };

  const shown = outbox.entries.find((e) => entryKey(e) === shownResult) ?? null;
  const dismissResult = () => setShownResult(null);

  return { onValid, onInvalid, remake, shown, dismissResult, formMessage, resultRef, remakeOptions, question, answerSameCoils };
}
