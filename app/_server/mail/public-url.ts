// The app's public address for links in mail, read from the environment.
import "server-only";

/** Public address of the app for links in mail (BEADLINE_PUBLIC_URL), without a trailing slash. */
export function publicUrl(): string {
  return (process.env.BEADLINE_PUBLIC_URL || "http://127.0.0.1:3000").replace(/\/+$/, "");
}
