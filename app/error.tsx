"use client";
// Any page whose server work failed (most often the database busy or briefly out of reach)
// shows this instead of the framework's bare error text: what happened in words, that
// nothing was changed, a way to try again and the reference the server logged it under.
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useTransition } from "react";
import { Button } from "@/components/ui/button";

export default function PageError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const again = () =>
    startTransition(() => {
      router.refresh(); // the server's part of the page is fetched again
      reset();
    });
  return (
    <main className="mx-auto flex max-w-xl flex-col gap-3 p-4" role="alert">
      <h1 className="text-2xl font-bold">This page could not be loaded</h1>
      <p>Nothing was changed. Beadline or its database may be busy or out of reach for a moment; try again shortly.</p>
      <p className="text-sm">
        Joints recorded on the Trench screen without signal stay on the device and are sent when the connection is back.
      </p>
      <div className="flex flex-wrap gap-2">
        <Button type="button" onClick={again} disabled={pending}>
          {pending ? "Trying again…" : "Try again"}
        </Button>
        <Link href="/" className="inline-flex min-h-touch items-center rounded-md px-4 font-semibold text-brand underline">
          Today
        </Link>
      </div>
      {error.digest ? <p className="text-sm text-slate-700">Reference for your administrator: {error.digest}</p> : null}
    </main>
  );
}
