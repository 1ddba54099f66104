import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { connection } from "next/server";
import "./globals.css";

// Inter ships with the app (from @fontsource/inter, licence in app/fonts/): nothing is fetched.
const inter = localFont({
  src: [
    { path: "./fonts/inter-latin-400-normal.woff2", weight: "400", style: "normal" },
    { path: "./fonts/inter-latin-600-normal.woff2", weight: "600", style: "normal" },
    { path: "./fonts/inter-latin-700-normal.woff2", weight: "700", style: "normal" },
  ],
  variable: "--font-inter",
  display: "swap",
});

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
    <html lang="en" className={inter.variable}>
      <body className="min-h-screen font-sans">{children}</body>
    </html>
  );
}
