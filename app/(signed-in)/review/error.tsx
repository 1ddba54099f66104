"use client";
import { Button } from "@/components/ui/button";

export default function ReviewError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div role="alert" className="flex flex-col gap-2">
      <h1 className="text-2xl font-bold">The review queue could not be loaded</h1>
      <p>Nothing was changed. Try again in a moment.</p>
      <Button type="button" onClick={reset}>
        Load the queue again
      </Button>
    </div>
  );
}
