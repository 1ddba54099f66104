"use client";
// One side of the joint: scan the coil label with the camera or type the coil id (or the
// F2897 code printed on the pipe). The coil is looked up on the device first (the crew's
// coils came with the page, so this works without signal), then on the server.
import dynamic from "next/dynamic";
import { useCallback, useState } from "react";
import { Button } from "@/components/ui/button";
import { formatQuantity, type UnitSystem } from "@/domain/units/format";
import { lookupCoilAction } from "../actions";
import { findLocalCoil } from "../_client/find-coil";
import type { TrenchCoil } from "@/app/_server/trench/setup-types";
import { controlBorder, FieldShell } from "@/components/form/field-shell";

// The camera scanner (and @zxing) loads when the fuser opens it, not with the page. Without
// signal (and not yet on the device) it says so; typing the coil id still works.
const CameraScanner = dynamic(
  () =>
    import("@/components/ui/camera-scanner").then(
      (m) => m.CameraScanner,
      () =>
        function CameraUnavailable({ fallback, onClose }: { fallback: string; onClose: () => void }) {
          return (
            <div role="alert" className="flex flex-col gap-2 rounded-md border-2 border-fail bg-fail-light p-2 font-semibold text-fail">
              <p>The camera scanner could not be loaded (no signal). {fallback}</p>
              <Button type="button" variant="secondary" onClick={onClose}>
                Close the camera
              </Button>
            </div>
          );
        },
    ),
  { ssr: false, loading: () => <p className="font-semibold text-ink">Starting the camera …</p> },
);

const STATUS_WORDS: Record<TrenchCoil["status"], string> = { "in-yard": "in the yard", "on-trailer": "on a trailer", "in-use": "in use", "used-up": "used up", quarantined: "quarantined" };

export function CoilSummary({ coil, system }: { coil: TrenchCoil; system: UnitSystem }) {
  const bad = coil.status === "quarantined" || coil.status === "used-up";
  return (
    <p className={`rounded-md border-2 px-3 py-2 text-sm ${bad ? "border-fail bg-fail-light text-fail" : "border-slate-300 bg-slate-50 text-ink"}`}>
      <span className="font-bold">{coil.code}</span> · {coil.manufacturer} lot {coil.lot} · {coil.nominalSize} {coil.series.toUpperCase()} SDR {coil.sdr} {coil.material} · OD {formatQuantity(coil.outsideDiameterMm, "length-mm", system)} ·{" "}
      {formatQuantity(coil.remainingM, "length-m", system)} left · {STATUS_WORDS[coil.status]}
      {coil.statusReason ? ` (${coil.statusReason})` : ""}
    </p>
  );
}

export function CoilPicker({
  side,
  value,
  coil,
  coils,
  preferCrewId = null,
  system,
  error,
  onText,
  onCoil,
}: {
  side: "A" | "B";
  value: string;
  coil: TrenchCoil | null;
  coils: TrenchCoil[];
  /** The fuser's crew: its coils win when a lot's F2897 code names several. */
  preferCrewId?: number | null;
  system: UnitSystem;
  error?: string;
  onText: (text: string) => void;
  onCoil: (coil: TrenchCoil | null) => void;
}) {
  const [scanning, setScanning] = useState(false);
  const [note, setNote] = useState<string | null>(null);
  const [looking, setLooking] = useState(false);
  const id = `coil${side}`;

  const resolve = useCallback(
    async (text: string) => {
      setNote(null);
      if (!text.trim()) {
        onCoil(null);
        return;
      }
      const local = findLocalCoil(coils, text, preferCrewId);
      if (local) {
        onText(local.code);
        onCoil(local);
        return;
      }
      if (!navigator.onLine) {
        onCoil(null);
        setNote("This coil is not in your crew's list on this device, and there is no signal to look it up. Check the label, or try again when the signal is back.");
        return;
      }
      setLooking(true);
      try {
        const r = await lookupCoilAction({ code: text });
        if (r.ok && r.data) {
          onText(r.data.code);
          onCoil(r.data);
        } else {
          onCoil(null);
          setNote(r.ok ? `No coil "${text.slice(0, 60)}" is on file. Check the label or type our coil id (such as LV-C0001).` : r.message);
        }
      } catch {
        onCoil(null);
        setNote("Could not look the coil up (no connection). Try again when the signal is back.");
      } finally {
        setLooking(false);
      }
    },
    [coils, preferCrewId, onCoil, onText],
  );

  const scanned = useCallback(
    (text: string) => {
      setScanning(false);
      onText(text);
      void resolve(text);
    },
    [onText, resolve],
  );

  return (
    <FieldShell id={id} label={`Coil on side ${side} (coil id, label address or F2897 code)`} note={note} error={error} size="large">
      {(control) => (
        <>
          <div className="flex gap-2">
            <input
              {...control}
              value={value}
              autoComplete="off"
              autoCapitalize="characters"
              onChange={(e) => {
                onText(e.target.value);
                if (coil) onCoil(null);
              }}
              onBlur={(e) => void resolve(e.target.value)}
              onKeyDown={(e) => {
                if (e.key === "Enter") {
                  e.preventDefault();
                  void resolve((e.target as HTMLInputElement).value);
                }
              }}
              className={`min-h-touch w-full rounded-md border-2 px-3 py-2 text-base ${controlBorder(error)} bg-white`}
            />
            <Button type="button" variant="secondary" onClick={() => void resolve(value)} disabled={looking}>
              {looking ? "Looking …" : `Look up coil ${side}`}
            </Button>
          </div>
          <Button type="button" variant="secondary" onClick={() => setScanning((s) => !s)}>
            {scanning ? `Stop scanning coil ${side}` : `Scan coil ${side} label with the camera`}
          </Button>
          {scanning ? <CameraScanner label={`Scanning coil ${side}`} instruction={`Scanning coil ${side}: point the camera at the coil label's QR code.`} fallback="Type the coil id from the label instead." onResult={scanned} onClose={() => setScanning(false)} /> : null}
          {coil ? <CoilSummary coil={coil} system={system} /> : null}
        </>
      )}
    </FieldShell>
  );
}
