"use client";
// Refusals (red: no joint can be recorded) and blocking warnings (amber: an inspector or
// admin must clear them for this job) before fusing, and the overrides that cleared them.
import { Button } from "@/components/ui/button";
import type { BlockReason, OverrideGrant } from "@/domain/joints/rules";
import type { TrenchOverride } from "@/app/_server/trench/setup-types";
import { formatInstant } from "@/components/ui/display-format";
import { useTimeZone } from "@/components/ui/time-zone";

export function BlocksPanel({ open, covered, overrides, onCheckAgain, checking }: { open: BlockReason[]; covered: { reason: BlockReason; grant: OverrideGrant }[]; overrides: TrenchOverride[]; onCheckAgain: () => void; checking: boolean }) {
  const timeZone = useTimeZone();
  if (!open.length && !covered.length) return null;
  const refusals = open.filter((r) => r.severity === "refuse");
  const needOverride = open.filter((r) => r.severity === "override");
  return (
    <div className="flex flex-col gap-2">
      {refusals.length ? (
        <div role="alert" className="rounded-md border-2 border-fail bg-fail-light p-3 text-fail">
          <h3 className="font-bold">You cannot record this joint</h3>
          <ul className="list-disc pl-5">
            {refusals.map((r) => (
              <li key={r.kind + r.message}>{r.message}</li>
            ))}
          </ul>
        </div>
      ) : null}
      {needOverride.length ? (
        <div role="alert" className="rounded-md border-2 border-caution bg-caution-light p-3 text-caution">
          <h3 className="font-bold">Blocked until an inspector or admin clears it</h3>
          <ul className="list-disc pl-5">
            {needOverride.map((r) => (
              <li key={r.kind + r.message}>{r.message}</li>
            ))}
          </ul>
          <p className="mt-1 text-sm">They clear it on Beadline under Trench → Overrides (/trench/overrides). Then check again here.</p>
          <Button type="button" variant="secondary" className="mt-2" onClick={onCheckAgain} disabled={checking}>
            {checking ? "Checking …" : "Check again for an override"}
          </Button>
        </div>
      ) : null}
      {covered.length ? (
        <div className="rounded-md border-2 border-brand bg-brand-light p-3 text-brand-dark">
          <h3 className="font-bold">Cleared by an override</h3>
          <ul className="list-disc pl-5">
            {covered.map(({ reason, grant }) => {
              const o = overrides.find((x) => x.id === grant.id);
              return (
                <li key={grant.id + reason.kind}>
                  {reason.message} Cleared by {o?.grantedByName ?? "an inspector"} until {formatInstant(grant.expiresAt, "minute", timeZone)}: “{o?.reason}”.
                </li>
              );
            })}
          </ul>
        </div>
      ) : null}
    </div>
  );
}
