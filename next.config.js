// Beadline's Next.js configuration. Database and spreadsheet packages stay outside
// the server bundle (knex's optional dialects would otherwise break the build).
const { attachmentPolicy, staticPolicy } = require("./security-policy.js");

const isProduction = process.env.NODE_ENV === "production";

/** Security headers for every response (the Content-Security-Policy is set per path below). */
function securityHeaders() {
  const headers = [
    { key: "X-Content-Type-Options", value: "nosniff" },
    { key: "Referrer-Policy", value: "same-origin" },
    { key: "X-Frame-Options", value: "DENY" },
    { key: "Permissions-Policy", value: "camera=(self), geolocation=(self), microphone=()" },
    // No other site may hold a window handle on Beadline or embed its answers (photos, JSON).
    { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
    { key: "Cross-Origin-Resource-Policy", value: "same-origin" },
  ];
  if (isProduction && process.env.BEADLINE_HSTS !== "off") {
    headers.push({ key: "Strict-Transport-Security", value: "max-age=31536000; includeSubDomains" });
  }
  return headers;
}

/**
 * Content-Security-Policy by path (security-policy.js). A header set here wins over the same
 * header set by a route handler (Next adds a handler's header only when it is not already
 * there), and proxy.ts's wins over this one. So: the attachment download gets its sandbox
 * policy here (and in its route), every other answer the strict static policy, and proxy.ts
 * replaces that with the nonce policy on pages.
 */
function contentSecurityPolicies() {
  return [
    { source: "/:path((?!api/v1/attachments/).*)", headers: [{ key: "Content-Security-Policy", value: staticPolicy() }] },
    { source: "/api/v1/attachments/:rest+", headers: [{ key: "Content-Security-Policy", value: attachmentPolicy() }] },
  ];
}

/** @type {import('next').NextConfig} */
const nextConfig = {
  distDir: process.env.BEADLINE_DIST_DIR || ".next",
  poweredByHeader: false,
  // Type-checking runs once in `npm test` (tsc --noEmit over the whole tree); the build skips it.
  typescript: { ignoreBuildErrors: true },
  // esbuild builds the service worker at build time (app/serwist/[path]/route.ts), as
  // @serwist/turbopack's withSerwist would add it.
  serverExternalPackages: ["knex", "mysql2", "exceljs", "pino", "nodemailer", "@aws-sdk/client-s3", "esbuild"],
  experimental: { serverActions: { bodySizeLimit: "12mb" } },
  async headers() {
    return [{ source: "/:path*", headers: securityHeaders() }, ...contentSecurityPolicies()];
  },
};

module.exports = nextConfig;
