"use client";
// Camera scanning of a coil label's QR code (@zxing/browser BrowserQRCodeReader). The
// label holds the coil page's address /coils/<coil id>; the caller reads it. The camera
// stops as soon as a code is read or the person closes the scanner.
import { useEffect, useRef, useState } from "react";
import { Button } from "@/components/ui/button";

export function QrScanner({ label, onResult, onClose }: { label: string; onResult: (text: string) => void; onClose: () => void }) {
  const video = useRef<HTMLVideoElement>(null);
  const [problem, setProblem] = useState<string | null>(null);

  useEffect(() => {
    let stopped = false;
    let controls: { stop: () => void } | null = null;
    void (async () => {
      try {
        if (!navigator.mediaDevices?.getUserMedia) throw new Error("no camera");
        const { BrowserQRCodeReader } = await import("@zxing/browser");
        const reader = new BrowserQRCodeReader(undefined, { delayBetweenScanAttempts: 200 });
        controls = await reader.decodeFromConstraints({ video: { facingMode: { ideal: "environment" } } }, video.current ?? undefined, (result, _error, c) => {
          if (result && !stopped) {
            stopped = true;
            c.stop();
            onResult(result.getText());
          }
        });
        if (stopped) controls.stop();
      } catch {
        setProblem("The camera is not available here (no camera, or permission refused). Type the coil id from the label instead.");
      }
    })();
    return () => {
      stopped = true;
      controls?.stop();
    };
  }, [onResult]);

  return (
    <div className="flex flex-col gap-2 rounded-md border-2 border-brand bg-white p-2" role="group" aria-label={label}>
      <p className="font-semibold">{label}: point the camera at the coil label&apos;s QR code.</p>
      {problem ? (
        <p role="alert" className="font-semibold text-fail">
          {problem}
        </p>
      ) : (
        <video ref={video} className="aspect-square w-full rounded bg-black object-cover" muted playsInline aria-label="Camera view" />
      )}
      <Button type="button" variant="secondary" onClick={onClose}>
        Close the camera
      </Button>
    </div>
  );
}
