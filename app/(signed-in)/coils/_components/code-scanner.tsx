"use client";
// Camera scanning of a traceability code's barcode (Code 128, Data Matrix or QR, read by
// @zxing/browser's multi-format reader). A handheld barcode scanner needs none of this:
// it types into the field like a keyboard. The camera stops once a code is read.
import { useEffect, useRef, useState } from "react";
import { Button } from "@/components/ui/button";

export function CodeScanner({ onResult, onClose }: { onResult: (text: string) => void; onClose: () => void }) {
  const video = useRef<HTMLVideoElement>(null);
  const [problem, setProblem] = useState<string | null>(null);

  useEffect(() => {
    let stopped = false;
    let controls: { stop: () => void } | null = null;
    void (async () => {
      try {
        if (!navigator.mediaDevices?.getUserMedia) throw new Error("no camera");
        const { BrowserMultiFormatReader } = await import("@zxing/browser");
        const reader = new BrowserMultiFormatReader(undefined, { delayBetweenScanAttempts: 200 });
        controls = await reader.decodeFromConstraints({ video: { facingMode: { ideal: "environment" } } }, video.current ?? undefined, (result, _error, c) => {
          if (result && !stopped) {
            stopped = true;
            c.stop();
            onResult(result.getText());
          }
        });
        if (stopped) controls.stop();
      } catch {
        setProblem("The camera is not available here (no camera, or permission refused). Type the code from the pipe or its tag instead.");
      }
    })();
    return () => {
      stopped = true;
      controls?.stop();
    };
  }, [onResult]);

  return (
    <div className="flex flex-col gap-2 rounded-md border-2 border-brand bg-white p-2" role="group" aria-label="Scan the traceability code">
      <p className="font-semibold">Point the camera at the barcode of the traceability code.</p>
      {problem ? (
        <p role="alert" className="font-semibold text-fail">
          {problem}
        </p>
      ) : (
        <video ref={video} className="aspect-video w-full max-w-md rounded bg-black object-cover" muted playsInline aria-label="Camera view" />
      )}
      <Button type="button" variant="secondary" onClick={onClose}>
        Close the camera
      </Button>
    </div>
  );
}
