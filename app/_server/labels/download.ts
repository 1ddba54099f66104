// Shared by the single-label downloads: the query schema and the file response.
import "server-only";
import { z } from "zod";
import { toNumberInput } from "@/domain/form-fields";

export const labelDownloadSchema = z.object({
  format: z.enum(["png", "svg"], { error: "Format must be png or svg." }).default("png"),
  stock: z.string().max(40).optional(),
  dpi: z.preprocess(toNumberInput, z.number({ error: "dpi must be a number." }).int({ error: "dpi must be a whole number." }).min(72, { error: "dpi must be 72 to 600." }).max(600, { error: "dpi must be 72 to 600." }).default(300)),
});

/** File names are built from our own ids only; anything else becomes "-". */
export function safeFileName(name: string): string {
  return name.replace(/[^A-Za-z0-9._-]+/g, "-").slice(0, 80) || "label";
}

export function labelFile(body: Buffer | string, format: "png" | "svg", name: string): Response {
  const type = format === "png" ? "image/png" : "image/svg+xml; charset=utf-8";
  const bytes = typeof body === "string" ? Buffer.from(body, "utf8") : body;
  return new Response(new Uint8Array(bytes), {
    status: 200,
    headers: {
      "content-type": type,
      "content-disposition": `attachment; filename="${safeFileName(name)}.${format}"`,
      "cache-control": "no-store",
    },
  });
}
