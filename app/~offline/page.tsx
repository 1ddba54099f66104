import type { Metadata } from "next";

export const metadata: Metadata = { title: "No signal" };

// Shown by the service worker (app/sw.ts) for a page that needs a connection when there is
// none. It carries nobody's data (rendered per request only for its script nonce, like every
// page; the worker keeps the header and HTML of one answer together). Plain links, so the
// browser asks the service worker for the Trench page it keeps.
export default function OfflinePage() {
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center gap-4 p-6">
      <p className="text-3xl font-bold text-brand">Beadline</p>
      <h1 className="text-2xl font-bold">No signal: this page needs a connection.</h1>
      <p className="text-lg">The Trench screen works offline once you have opened Beadline here with signal.</p>
      <a href="/trench" className="flex min-h-touch items-center justify-center rounded-md bg-brand px-4 text-lg font-semibold text-white">
        Open the Trench screen
      </a>
      <p>Reload this page when you have signal again.</p>
    </main>
  );
}
