import type { Metadata, Viewport } from "next";
import { connection } from "next/server";
import "./globals.css";

// The system's own interface font (Roboto, San Francisco, Segoe UI …): nothing to fetch
// before the first paint, which matters on a phone with poor signal at the trench.
export const metadata: Metadata = {
  title: { default: "Beadline", template: "%s · Beadline" },
  description: "Fusion-joint quality log with lot traceability for PE gas pipe crews.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#0b4f6c" };

// Every page renders per request: the Content-Security-Policy's nonce (proxy.ts) is new on
// each answer and Next.js puts it on the page's scripts, which a page built ahead of time
// could not carry.
export default async function RootLayout({ children }: { children: React.ReactNode }) {
  await connection();
  return (
    <html lang="en">
      <body className="min-h-screen font-sans">{children}</body>
    </html>
  );
}
