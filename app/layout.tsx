import type { Metadata, Viewport } from "next";
import "./globals.css";

// The system's own interface font (Roboto, San Francisco, Segoe UI …): nothing to fetch
// before the first paint, which matters on a phone with poor signal at the trench.
export const metadata: Metadata = {
  title: { default: "Beadline", template: "%s · Beadline" },
  description: "Fusion-joint quality log with lot traceability for PE gas pipe crews.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#0b4f6c" };

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <body className="min-h-screen font-sans">{children}</body>
    </html>
  );
}
