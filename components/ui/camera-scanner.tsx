"use client";
// Camera scanning with @zxing/browser: QR codes (coil labels, which hold the coil page's
// address /coils/<coil id>) or any common barcode (traceability codes printed on pipe tags:
// Code 128, Data Matrix or QR). A handheld scanner needs none of this: it types like a
// keyboard. The camera stops as soon as a code is read or the person closes the scanner.
import { useEffect, useRef, useState } from "react";
import { Button } from "./button";

export function CameraScanner({
  label,
  instruction,
  fallback,
  formats = "qr",
  aspect = "square",
  onResult,
  onClose,
}: {
  label: string;
  instruction: string;
  fallback: string;
  formats?: "qr" | "any";
  aspect?: "square" | "video";
  onResult: (text: string) => void;
  onClose: () => void;
}) {
  const video = useRef<HTMLVideoElement>(null);
  const [problem, setProblem] = useState<string | null>(null);

  useEffect(() => {
    let stopped = false;
    let controls: { stop: () => void } | null = null;
    void (async () => {
      try {
        if (!navigator.mediaDevices?.getUserMedia) throw new Error("no camera");
        const zxing = await import("@zxing/browser");
        const options = { delayBetweenScanAttempts: 200 };
        const reader = formats === "qr" ? new zxing.BrowserQRCodeReader(undefined, options) : new zxing.BrowserMultiFormatReader(undefined, options);
        controls = await reader.decodeFromConstraints({ video: { facingMode: { ideal: "environment" } } }, video.current ?? undefined, (result, _error, c) => {
          if (result && !stopped) {
            stopped = true;
            c.stop();
            onResult(result.getText());
          }
        });
        if (stopped) controls.stop();
      } catch {
        setProblem(`The camera is not available here (no camera, or permission refused). ${fallback}`);
      }
    })();
    return () => {
      stopped = true;
      controls?.stop();
    };
  }, [onResult, formats, fallback]);

  return (
    <div className="flex flex-col gap-2 rounded-md border-2 border-brand bg-white p-2" role="group" aria-label={label}>
      <p className="font-semibold">{instruction}</p>
      {problem ? (
        <p role="alert" className="font-semibold text-fail">
          {problem}
        </p>
      ) : (
        <video ref={video} className={`${aspect === "square" ? "aspect-square w-full" : "aspect-video w-full max-w-md"} rounded bg-black object-cover`} muted playsInline aria-label="Camera view" />
      )}
      <Button type="button" variant="secondary" onClick={onClose}>
        Close the camera
      </Button>
    </div>
  );
}
