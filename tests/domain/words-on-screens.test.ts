// Every state, kind and enum reaches people as words, never as its internal value
// ("on-trailer" → "On trailer"): the screens (app/ and components/ .tsx) must not render a
// status, kind, outcome, review state, shelter or standard straight from a record; they go
// through the concept's word table (COIL_STATUS_LABELS, JOINT_KIND_LABELS, REVISION_KIND_LABELS,
// OUTCOME_LABELS, REVIEW_STATE_LABELS, SHELTER_LABELS, builtInProcedure(id).label …) or a badge.
// common practice (no published source): a value a person reads is written in their words.
import { readFileSync, readdirSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { describe, expect, it } from "vitest";
import { COIL_STATUSES, COIL_STATUS_LABELS } from "@/domain/coils/statuses";
import { OUTCOME_LABELS } from "@/domain/joints/outcomes";
import { REVIEW_STATE_LABELS } from "@/domain/joints/review-states";
import { REVISION_KIND_LABELS } from "@/domain/joints/revision-kinds";
import { JOINT_KIND_LABELS, SHELTER_LABELS } from "@/domain/joints/schemas";

const ROOT = join(__dirname, "..", "..");
const ENUM_FIELDS = "status|kind|outcome|reviewState|toStatus|fromStatus|shelter|standard|state|method|role";
// `{coil.status}` as a JSX child (not `status={coil.status}`, an attribute), and `${coil.status}` in text.
const JSX_CHILD = new RegExp(`(?<![=$\\w])\\{\\s*[\\w.?!]+\\.(?:${ENUM_FIELDS})\\s*\\}`, "g");
const IN_TEXT = new RegExp(`\\$\\{\\s*[\\w.?!]+\\.(?:${ENUM_FIELDS})\\s*\\}`, "g");

/** Places in one file's text where an enum field is rendered raw: "line: fragment". */
function rawEnumRenders(source: string): string[] {
  const found: string[] = [];
  source.split("\n").forEach((line, i) => {
    if (/^\s*(\/\/|\*|import )/.test(line)) return;
    for (const pattern of [JSX_CHILD, IN_TEXT]) {
      for (const match of line.matchAll(pattern)) {
        const before = line.slice(0, match.index);
        // A template inside key=/href=/className= is an address or a key, not text a person reads.
        if (/(key|href|className|id|dedupeKey)=\{?`[^`]*$/.test(before)) continue;
        // An HTTP answer's status is a number, not a word of the domain.
        if (/\bresponse\.status\b/.test(match[0])) continue;
        found.push(`${i + 1}: ${match[0]}`);
      }
    }
  });
  return found;
}

function screenFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return name === "node_modules" ? [] : screenFiles(path);
    return path.endsWith(".tsx") ? [path] : [];
  });
}

describe("screens show enum values in words", () => {
  it("the scanner catches a raw value and lets a word table or a badge through", () => {
    expect(rawEnumRenders("<td>{coil.status}</td>")).toEqual(["1: {coil.status}"]);
    expect(rawEnumRenders("label: `${c.coilCode} · ${c.status}`")).toEqual(["1: ${c.status}"]);
    expect(rawEnumRenders("{r.revisionNo}. {r.kind} by {r.byUserName}")).toEqual(["1: {r.kind}"]);
    expect(rawEnumRenders('<CoilStatusBadge status={c.status} />')).toEqual([]);
    expect(rawEnumRenders("{COIL_STATUS_LABELS[c.status]}")).toEqual([]);
    expect(rawEnumRenders("<a href={`/trace?kind=${j.kind}`}>")).toEqual([]);
  });

  it("no screen in app/ or components/ renders a status, kind or outcome raw", () => {
    const problems = [...screenFiles(join(ROOT, "app")), ...screenFiles(join(ROOT, "components"))].flatMap((path) =>
      rawEnumRenders(readFileSync(path, "utf8")).map((hit) => `${relative(ROOT, path)}:${hit}`),
    );
    expect(problems).toEqual([]);
  });

  it("every word table gives words, not the value itself", () => {
    // A label equal to its internal value ("on-trailer") or spelled with a hyphen-joined
    // lower-case value would put the raw value on screen through the table itself.
    const tables: Record<string, Record<string, string>> = { COIL_STATUS_LABELS, OUTCOME_LABELS, REVIEW_STATE_LABELS, REVISION_KIND_LABELS, JOINT_KIND_LABELS, SHELTER_LABELS };
    for (const [name, table] of Object.entries(tables)) {
      for (const [value, label] of Object.entries(table)) {
        expect(label, `${name}.${value}`).not.toBe(value);
        expect(label, `${name}.${value}`).not.toMatch(/^[a-z]+(-[a-z]+)+$/);
      }
    }
    expect(Object.keys(COIL_STATUS_LABELS).sort()).toEqual([...COIL_STATUSES].sort());
  });
});
