// Input schemas of the Coils and Trace screens and their JSON API, shared by the forms
// (zodResolver) and the server (parsed again by the action/route wrapper). Lengths are
// typed in the user's units and leave the schema in canonical SI (m, mm).
import { z } from "zod";
import { COIL_STATUSES } from "@/domain/coils/statuses";
import { optionalId as optionalIdOf, requiredId } from "@/domain/form-fields";
import { PIPE_SERIES, findPipeSize } from "@/domain/pipe/catalogue";
import { parseTraceCode } from "@/domain/trace-code/trace-code";
import { ftToM, inToMm } from "@/domain/units/conversions";
import { DAMAGE_KINDS, DEFAULT_GOUGE_LIMIT_PCT, DEFAULT_OVALITY_LIMIT_PCT, traceCodeDisagreements } from "@/domain/coils/life";

/** "" / null / undefined → undefined; "12,5" → 12.5; other text → NaN (refused with the message). */
function toNumber(value: unknown): unknown {
  if (value === "" || value === null || value === undefined) return undefined;
  if (typeof value === "string") {
    const text = value.trim().replace(",", ".");
    return text === "" ? undefined : Number(text);
  }
  return value;
}

/** A number typed in a form or sent as JSON; `rules` adds the bounds with their messages. */
function numberField(message: string, rules: (n: z.ZodNumber) => z.ZodNumber = (n) => n) {
  return z.preprocess(toNumber, rules(z.number({ error: message })));
}

function optionalNumberField(message: string, rules: (n: z.ZodNumber) => z.ZodNumber = (n) => n) {
  return z.preprocess(toNumber, rules(z.number({ error: message })).optional());
}

function defaultedNumberField(message: string, fallback: number, rules: (n: z.ZodNumber) => z.ZodNumber = (n) => n) {
  return z.preprocess((v) => toNumber(v) ?? fallback, rules(z.number({ error: message })));
}

function optionalText(max: number, label: string) {
  return z.preprocess(
    (v) => (typeof v === "string" && v.trim() === "" ? undefined : v ?? undefined),
    z.string().trim().max(max, { error: `${label} is too long (${max} characters at most).` }).optional(),
  );
}

const checkbox = (message: string) =>
  z.preprocess((v) => (v === "on" || v === "true" ? true : v === "false" || v === "" ? false : v), z.boolean({ error: message }));

const isoDate = /^\d{4}-\d{2}-\d{2}$/;

function isRealDate(text: string): boolean {
  if (!isoDate.test(text)) return false;
  const [y, m, d] = text.split("-").map(Number) as [number, number, number];
  const date = new Date(Date.UTC(y, m - 1, d));
  return date.getUTCFullYear() === y && date.getUTCMonth() === m - 1 && date.getUTCDate() === d;
}

/** Page names under /coils/ that a coil id may not take. */
export const RESERVED_COIL_CODES: readonly string[] = ["receive", "new"];

export const COIL_CODE_PATTERN = /^[A-Za-z0-9][A-Za-z0-9._-]{1,39}$/;

/**
 * The receipt form's field labels, as the person sees them: the form shows these, and every
 * message that names a field (the code's disagreements, what the code filled, the summary of
 * a refused form) uses them, never the field's internal name.
 */
export const RECEIVE_COIL_LABELS = {
  traceCode: "ASTM F2897 code (16 characters)",
  coilCode: "Coil id (printed on our label)",
  manufacturer: "Pipe maker",
  manufacturerCode: "Manufacturer id in the code",
  lot: "Lot",
  productionDate: "Production date",
  material: "Material designation",
  series: "Size series",
  nominalSize: "Nominal size",
  sdr: "SDR (DR)",
  length: "Coil length",
  lengthUnit: "Unit",
  printLine: "Print line as written on the pipe",
  disagreementReason: "Why the coil is saved although it disagrees with its code",
  damageKinds: "Damage found",
  gougeDepth: "Deepest gouge",
  gougeLimitPct: "Operator's gouge limit (% of wall)",
  ovalityPct: "Ovality measured at the end",
  ovalityLimitPct: "Ovality limit",
  endCapsInPlace: "End caps in place on both ends",
  damageNotes: "Inspection notes",
  smallUnit: "Unit",
} as const satisfies Record<string, string>;

/** Receive a coil: what the print line and the F2897 code say, and the receipt inspection. */
export const receiveCoilSchema = z
  .object({
    coilCode: z
      .string({ error: "Enter the coil id for the label." })
      .trim()
      .regex(COIL_CODE_PATTERN, { error: "Coil id: 2–40 letters, digits, dots, dashes or underscores, starting with a letter or digit." })
      .refine((code) => !RESERVED_COIL_CODES.includes(code.toLowerCase()), { error: "That word is a Beadline page name; choose another coil id." }),
    manufacturer: z.string({ error: "Enter the pipe maker." }).trim().min(2, { error: "Enter the pipe maker." }).max(120, { error: "Pipe maker is too long (120 characters at most)." }),
    manufacturerCode: z.preprocess(
      (v) => (typeof v === "string" && v.trim() === "" ? undefined : v ?? undefined),
      z.string().trim().regex(/^[0-9A-Za-z]{2}$/, { error: "Manufacturer id in the code is 2 letters or digits." }).optional(),
    ),
    lot: z.string({ error: "Enter the lot." }).trim().min(1, { error: "Enter the lot." }).max(40, { error: "Lot is too long (40 characters at most)." }),
    productionDate: z.preprocess(
      (v) => (v === "" || v == null ? undefined : v),
      z.string().refine(isRealDate, { error: "Production date must be a real date (YYYY-MM-DD)." }).optional(),
    ),
    material: z.string({ error: "Enter the material designation." }).trim().min(2, { error: "Enter the material designation (e.g. PE4710)." }).max(20, { error: "Material is too long (20 characters at most)." }),
    series: z.enum(PIPE_SERIES, { error: "Choose IPS, CTS or metric." }),
    nominalSize: z.string({ error: "Enter the nominal size." }).trim().min(1, { error: "Enter the nominal size." }).max(20),
    sdr: numberField("SDR must be a number.", (n) => n.gt(2, { error: "SDR must be more than 2." }).max(41, { error: "SDR above 41 is not coiled gas pipe." })),
    length: numberField("Enter the coil length as a number.", (n) => n.gt(0, { error: "Coil length must be more than 0." })),
    lengthUnit: z.enum(["m", "ft"], { error: "Length unit must be m or ft." }).default("m"),
    printLine: optionalText(300, "Print line"),
    traceCode: z.preprocess(
      (v) => (typeof v === "string" && v.trim() === "" ? undefined : typeof v === "string" ? v.trim() : v ?? undefined),
      z
        .string()
        .superRefine((code, ctx) => {
          const parsed = parseTraceCode(code);
          if (!parsed.ok) ctx.addIssue({ code: "custom", message: parsed.error });
        })
        .optional(),
    ),
    disagreementReason: optionalText(300, "The reason"),
    damageKinds: z.array(z.enum(DAMAGE_KINDS, { error: "Unknown kind of damage." })).default([]),
    damageNotes: optionalText(500, "Damage notes"),
    gougeDepth: optionalNumberField("Gouge depth must be a number.", (n) => n.min(0, { error: "Gouge depth cannot be negative." })),
    smallUnit: z.enum(["mm", "in"], { error: "Unit must be mm or in." }).default("mm"),
    gougeLimitPct: defaultedNumberField("Gouge limit must be a number.", DEFAULT_GOUGE_LIMIT_PCT, (n) =>
      n.gt(0, { error: "Gouge limit must be more than 0 %." }).max(50, { error: "Gouge limit above 50 % of the wall is not a limit." }),
    ),
    ovalityPct: optionalNumberField("Ovality must be a number.", (n) => n.min(0, { error: "Ovality cannot be negative." }).max(50, { error: "Ovality above 50 % cannot be right; measure again." })),
    ovalityLimitPct: defaultedNumberField("Ovality limit must be a number.", DEFAULT_OVALITY_LIMIT_PCT, (n) =>
      n.gt(0, { error: "Ovality limit must be more than 0 %." }).max(20, { error: "Ovality limit above 20 % is not a limit." }),
    ),
    endCapsInPlace: checkbox("Say whether the end caps are in place."),
  })
  .superRefine((value, ctx) => {
    try {
      findPipeSize(value.series, value.nominalSize);
    } catch (error) {
      ctx.addIssue({ code: "custom", path: ["nominalSize"], message: (error as Error).message });
    }
    // A coil whose typed fields disagree with its code is saved only with a reason (kept in
    // the audit log): otherwise a recall by the code's lot could miss it.
    // An unreadable code is refused on its own field; there is nothing to disagree with.
    if (value.traceCode && !value.disagreementReason && parseTraceCode(value.traceCode).ok) {
      const fields = [...new Set(traceCodeDisagreements(value.traceCode, value).map((flag) => flag.field))];
      if (fields.length) {
        const names = fields.map((field) => (field === "traceCode" ? "the code's component type" : RECEIVE_COIL_LABELS[field as keyof typeof RECEIVE_COIL_LABELS] ?? "another field"));
        ctx.addIssue({
          code: "custom",
          path: ["disagreementReason"],
          message: `The code disagrees with ${names.join(", ")}: correct the fields or the code, or say why the coil is saved as it is.`,
        });
      }
    }
    if (value.length !== undefined && (value.lengthUnit === "ft" ? ftToM(value.length) : value.length) > 3000) {
      ctx.addIssue({ code: "custom", path: ["length"], message: "Coil length above 3,000 m (9,843 ft) cannot be right." });
    }
  })
  .transform((value) => {
    const outsideDiameterMm = findPipeSize(value.series, value.nominalSize).outsideDiameterMm;
    return {
      ...value,
      nominalSize: findPipeSize(value.series, value.nominalSize).nominal,
      outsideDiameterMm,
      lengthM: Math.round((value.lengthUnit === "ft" ? ftToM(value.length) : value.length) * 100) / 100,
      gougeDepthMm: value.gougeDepth === undefined ? null : Math.round((value.smallUnit === "in" ? inToMm(value.gougeDepth) : value.gougeDepth) * 100) / 100,
    };
  });
export type ReceiveCoilInput = z.input<typeof receiveCoilSchema>;
export type ReceiveCoil = z.output<typeof receiveCoilSchema>;

const id = (label: string) => requiredId(`${label} is missing.`, "int", `${label} is not a coil on file.`);
const optionalId = (message: string) => optionalIdOf(message);

/** Move a coil to another status (quarantine with a reason, trailer with a crew, use with a job). */
export const moveCoilSchema = z.object({
  coilId: id("Coil id"),
  version: id("Record version"),
  to: z.enum(COIL_STATUSES, { error: "Choose the new status." }),
  reason: optionalText(300, "Reason"),
  crewId: optionalId("Choose a crew."),
  jobId: optionalId("Choose a job."),
});
export type MoveCoilInput = z.input<typeof moveCoilSchema>;
export type MoveCoil = z.output<typeof moveCoilSchema>;

/** Mark labels printed (after the print dialog) for a set of coils. */
export const markLabelsPrintedSchema = z.object({
  coilIds: z.array(id("Coil id"), { error: "Choose at least one coil." }).min(1, { error: "Choose at least one coil." }).max(500, { error: "At most 500 labels at once." }),
  /** Sent to the printer from the Labels screen, or downloaded as a file from the coil's page. */
  how: z.enum(["print", "png", "svg"], { error: "Say whether the labels were printed or downloaded as PNG or SVG." }).default("print"),
});

/**
 * Trace search: by manufacturer + lot (manufacturer optional), or by one code — our coil
 * id, an F2897 code, or a label URL.
 */
export const traceSearchSchema = z
  .object({
    manufacturer: optionalText(120, "Manufacturer"),
    lot: optionalText(40, "Lot"),
    code: optionalText(300, "Code"),
  })
  .superRefine((value, ctx) => {
    if (!value.lot && !value.code) {
      ctx.addIssue({ code: "custom", path: ["lot"], message: "Enter a lot (with its manufacturer), or a traceability code or coil id." });
    }
    if (value.manufacturer && !value.lot && !value.code) {
      ctx.addIssue({ code: "custom", path: ["manufacturer"], message: "A manufacturer alone is too wide: add the lot." });
    }
  });
export type TraceSearchInput = z.input<typeof traceSearchSchema>;
export type TraceSearch = z.output<typeof traceSearchSchema>;
