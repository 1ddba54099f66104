// Serves the service worker that Serwist builds from app/sw.ts (with esbuild, at build time:
// the route is static). The precache list is the build's static files plus the offline page.
import { randomUUID } from "node:crypto";
import { createSerwistRoute } from "@serwist/turbopack";
import { OFFLINE_PAGE_PATH } from "@/components/offline/names";

// The offline page is fetched again with every build (its HTML names that build's files).
const revision = randomUUID();

// The build folder, as next.config.js sets it (the browser tests build into their own).
const distDir = (process.env.BEADLINE_DIST_DIR || ".next").replace(/^\.\//, "").replace(/\/$/, "");

const serwist = createSerwistRoute({
  swSrc: "app/sw.ts",
  additionalPrecacheEntries: [{ url: OFFLINE_PAGE_PATH, revision }],
  // Serwist's default list for Next.js, so a screen opened without signal looks as it does with signal.
  globPatterns: [`${distDir}/static/**/*.{js,css,html,ico,png,svg,webp,json,webmanifest}`],
  // The native esbuild package is installed; Serwist would otherwise load esbuild-wasm.
  useNativeEsbuild: true,
});

// Built once at build time (prerendered): no request runs this handler, other paths are 404.
export const dynamic = "force-static";
export const dynamicParams = false;
export const revalidate = false;
export const { generateStaticParams, GET } = serwist;
