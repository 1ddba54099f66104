"use client";
// Up to 6 photos of the bead, kept on the device (IndexedDB) until the joint is sent.
// Large JPEG/PNG/WebP pictures are scaled down on the device (longest side 2400 px) so
// they fit the 10 MB limit and a poor connection; HEIC goes as taken.
import { useEffect, useState } from "react";
import { Button } from "@/components/ui/button";
import { MAX_PHOTOS_PER_JOINT } from "@/domain/joints/record-words";
import { FieldShell } from "@/components/form/field-shell";
import { dropPhoto, readPhoto, storePhoto, type PhotoRef } from "../_client/device-store";

const MAX_BYTES = 10 * 1024 * 1024;
const MAX_SIDE_PX = 2400;
const ACCEPT = "image/jpeg,image/png,image/webp,image/heic,image/heif,.heic,.heif";

async function downscale(file: File): Promise<Blob> {
  if (!/^image\/(jpeg|png|webp)$/.test(file.type) || typeof createImageBitmap !== "function") return file;
  try {
    const bitmap = await createImageBitmap(file);
    const scale = Math.min(1, MAX_SIDE_PX / Math.max(bitmap.width, bitmap.height));
    if (scale === 1 && file.size <= 2 * 1024 * 1024) return file;
    const canvas = document.createElement("canvas");
    canvas.width = Math.round(bitmap.width * scale);
    canvas.height = Math.round(bitmap.height * scale);
    canvas.getContext("2d")?.drawImage(bitmap, 0, 0, canvas.width, canvas.height);
    const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, "image/jpeg", 0.85));
    return blob ?? file;
  } catch {
    return file;
  }
}

export function PhotoPicker({ photos, onChange }: { photos: PhotoRef[]; onChange: (photos: PhotoRef[]) => void }) {
  const [urls, setUrls] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);

  useEffect(() => {
    let alive = true;
    const made: string[] = [];
    void (async () => {
      const next: Record<string, string> = {};
      for (const p of photos) {
        const blob = await readPhoto(p).catch(() => undefined);
        if (blob) {
          const url = URL.createObjectURL(blob);
          made.push(url);
          next[p.key] = url;
        }
      }
      if (alive) setUrls(next);
    })();
    return () => {
      alive = false;
      for (const u of made) URL.revokeObjectURL(u);
    };
  }, [photos]);

  const add = async (files: FileList | null) => {
    setMessage(null);
    if (!files?.length) return;
    const next = [...photos];
    const problems: string[] = [];
    for (const file of Array.from(files)) {
      if (next.length >= MAX_PHOTOS_PER_JOINT) {
        problems.push(`At most ${MAX_PHOTOS_PER_JOINT} photos per joint.`);
        break;
      }
      const blob = await downscale(file);
      if (blob.size > MAX_BYTES) {
        problems.push(`${file.name} is larger than 10 MB.`);
        continue;
      }
      next.push(await storePhoto(blob, file.name || "bead-photo.jpg"));
    }
    onChange(next);
    if (problems.length) setMessage(problems.join(" "));
  };

  return (
    <div className="flex flex-col gap-2">
      <FieldShell id="photos" label={`Photos of the bead (${photos.length} of ${MAX_PHOTOS_PER_JOINT}; JPEG, PNG, WebP or HEIC, 10 MB each at most)`} error={message} errorRole="alert" size="large">
        {(control) => (
          <input
            {...control}
            type="file"
            accept={ACCEPT}
            capture="environment"
            multiple
            disabled={photos.length >= MAX_PHOTOS_PER_JOINT}
            onChange={(e) => {
              void add(e.target.files);
              e.target.value = "";
            }}
            className="min-h-touch rounded-md border-2 border-slate-400 bg-white p-2 text-base"
          />
        )}
      </FieldShell>
      {photos.length ? (
        <ul className="grid grid-cols-3 gap-2">
          {photos.map((p, i) => (
            <li key={p.key} className="flex flex-col gap-1">
              {urls[p.key] ? (
                // eslint-disable-next-line @next/next/no-img-element
                <img src={urls[p.key]} alt={`Bead photo ${i + 1}`} className="aspect-square w-full rounded object-cover" />
              ) : (
                <span className="flex aspect-square items-center justify-center rounded bg-slate-200 text-xs">{p.name}</span>
              )}
              <Button
                type="button"
                variant="secondary"
                className="px-2 text-sm"
                onClick={() => {
                  void dropPhoto(p);
                  onChange(photos.filter((x) => x.key !== p.key));
                }}
              >
                Remove photo {i + 1}
              </Button>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
