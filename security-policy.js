// Content-Security-Policy texts, in one place for next.config.js (every answer) and proxy.ts
// (pages, with a fresh nonce per request).
// source: CSP Level 3 (W3C): 'nonce-…', 'strict-dynamic', sandbox, frame-ancestors;
// Next.js guide "Content Security Policy" (a nonce set in proxy.ts is put on Next's own
// scripts; pages must render dynamically). OWASP Content Security Policy Cheat Sheet.

/**
 * The policy of pages. Scripts: only those carrying this response's nonce, and what they
 * load ('strict-dynamic'; 'self' stays for browsers without it). Development adds
 * 'unsafe-eval' (React's dev tools need it), never production.
 * Styles keep 'unsafe-inline': React writes style="" attributes in the server's HTML (bars,
 * column widths) and the data grid adds <style> elements at run time; a nonce cannot cover
 * attributes, and a nonce in style-src would switch 'unsafe-inline' off. Styles run no code.
 */
function pagePolicy({ nonce, dev = false }) {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "media-src 'self' blob:",
    "worker-src 'self' blob:",
    "manifest-src 'self'",
    "frame-ancestors 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "object-src 'none'",
  ].join("; ");
}

/** Every other answer (API JSON, the build's files, the service worker): no inline script at all. */
function staticPolicy() {
  return [
    "default-src 'self'",
    "script-src 'self'",
    "style-src 'self'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "worker-src 'self'",
    "frame-ancestors 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "object-src 'none'",
  ].join("; ");
}

/**
 * A stored file (bead photo, pressure trace, evidence) opened from /api/v1/attachments/:id:
 * a sandbox with nothing allowed but showing the file itself, so a file that a browser might
 * render as a document can run no script, submit no form and reach no origin.
 */
function attachmentPolicy() {
  return "default-src 'none'; img-src 'self'; media-src 'self'; sandbox; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";
}

/** The path every attachment download is served under (its own policy, not the static one). */
const ATTACHMENT_PATH_PREFIX = "/api/v1/attachments/";

module.exports = { pagePolicy, staticPolicy, attachmentPolicy, ATTACHMENT_PATH_PREFIX };
