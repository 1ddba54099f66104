// Beadline's Next.js configuration. Database and spreadsheet packages stay outside
// the server bundle (knex's optional dialects would otherwise break the build).
const isProduction = process.env.NODE_ENV === "production";

/** Security headers for every response; CSP allows no eval in production. */
function securityHeaders() {
  const csp = [
    "default-src 'self'",
    `script-src 'self' 'unsafe-inline'${isProduction ? "" : " 'unsafe-eval'"}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "media-src 'self' blob:",
    "worker-src 'self' blob:",
    "frame-ancestors 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "object-src 'none'",
  ].join("; ");
  const headers = [
    { key: "Content-Security-Policy", value: csp },
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
    return [{ source: "/:path*", headers: securityHeaders() }];
  },
};

module.exports = nextConfig;
