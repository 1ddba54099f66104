// Core schema of Beadline: people, procedures, jobs, coils, equipment, joints and their
// evidence. Canonical SI units (mm, MPa, °C, s, m). Joints, joint revisions, reviews and
// the audit log are append-only; the current review state of a joint lives in the
// joint_states projection, written in the same transaction as each revision.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("crews", (t) => {
    t.increments("id").primary();
    t.string("name", 120).notNullable().unique();
    t.string("trailer", 120).nullable();
    t.boolean("is_active").notNullable().defaultTo(true);
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });

  await knex.schema.createTable("users", (t) => {
    t.increments("id").primary();
    t.string("name", 160).notNullable();
    t.string("email", 254).notNullable().unique();
    t.string("password_hash", 100).notNullable();
    // Comma-separated subset of fuser,inspector,clerk,admin (mapped to an array in queries/users.ts).
    t.string("roles", 100).notNullable();
    t.enu("unit_system", ["si", "us"]).notNullable().defaultTo("si");
    t.boolean("is_active").notNullable().defaultTo(true);
    t.integer("session_version").unsigned().notNullable().defaultTo(1);
    t.integer("crew_id").unsigned().nullable().references("id").inTable("crews");
    t.boolean("daily_digest").notNullable().defaultTo(false);
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("updated_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });

  await knex.schema.createTable("sign_in_attempts", (t) => {
    t.bigIncrements("id").primary();
    t.string("email", 254).notNullable();
    t.string("address", 64).notNullable();
    t.boolean("succeeded").notNullable();
    t.timestamp("attempted_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["email", "attempted_at"]);
    t.index(["address", "attempted_at"]);
  });

  await knex.schema.createTable("audit_log", (t) => {
    t.bigIncrements("id").primary();
    t.timestamp("at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.integer("actor_user_id").unsigned().nullable();
    t.string("action", 80).notNullable();
    t.string("entity_type", 40).notNullable();
    t.string("entity_id", 64).nullable();
    t.text("details").nullable(); // JSON
    t.string("request_id", 64).nullable();
    t.index(["entity_type", "entity_id"]);
    t.index(["actor_user_id", "at"]);
    t.index(["action", "at"]);
  });

  await knex.schema.createTable("procedures", (t) => {
    t.increments("id").primary();
    t.string("code", 40).notNullable().unique();
    t.string("name", 200).notNullable();
    // Published standard the procedure derives from (domain/fusion standard id).
    t.string("standard", 40).notNullable();
    t.boolean("is_active").notNullable().defaultTo(true);
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });

  await knex.schema.createTable("procedure_versions", (t) => {
    t.increments("id").primary();
    t.integer("procedure_id").unsigned().notNullable().references("id").inTable("procedures");
    t.integer("version_no").unsigned().notNullable();
    t.text("definition", "mediumtext").notNullable(); // JSON ProcedureDefinition (domain/fusion)
    t.text("notes").nullable();
    t.integer("published_by").unsigned().nullable().references("id").inTable("users");
    t.timestamp("published_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("superseded_at", { precision: 3 }).nullable();
    t.unique(["procedure_id", "version_no"]);
  });

  await knex.schema.createTable("jobs", (t) => {
    t.increments("id").primary();
    t.string("code", 40).notNullable().unique();
    t.string("name", 200).notNullable();
    t.string("place", 300).nullable();
    t.decimal("latitude", 9, 6).nullable();
    t.decimal("longitude", 9, 6).nullable();
    t.date("starts_on").nullable();
    t.date("ends_on").nullable();
    t.enu("status", ["open", "closed"]).notNullable().defaultTo("open");
    t.integer("procedure_id").unsigned().notNullable().references("id").inTable("procedures");
    t.integer("crew_id").unsigned().nullable().references("id").inTable("crews");
    t.string("pipe_sizes", 300).nullable(); // free text list, e.g. "2 IPS SDR 11; 4 IPS SDR 11"
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("updated_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });

  // Gap-free joint numbers: one counter row per job, locked FOR UPDATE in the inserting transaction.
  await knex.schema.createTable("job_counters", (t) => {
    t.integer("job_id").unsigned().primary().references("id").inTable("jobs");
    t.integer("last_joint_no").unsigned().notNullable().defaultTo(0);
  });

  await knex.schema.createTable("coils", (t) => {
    t.increments("id").primary();
    t.string("coil_code", 40).notNullable().unique(); // our own coil id, printed on the label
    t.string("manufacturer", 120).notNullable();
    t.string("manufacturer_code", 2).nullable(); // F2897 two-character manufacturer id
    t.string("lot", 40).notNullable();
    t.date("production_date").nullable();
    t.string("material", 20).notNullable(); // PE2708, PE4710, PE100 …
    t.enu("series", ["ips", "cts", "metric"]).notNullable();
    t.string("nominal_size", 20).notNullable();
    t.decimal("outside_diameter_mm", 8, 2).notNullable();
    t.decimal("sdr", 6, 2).notNullable();
    t.decimal("length_m", 9, 2).notNullable();
    t.decimal("remaining_m", 9, 2).notNullable();
    t.string("print_line", 300).nullable();
    t.string("trace_code", 16).nullable();
    t.enu("status", ["in-yard", "on-trailer", "in-use", "used-up", "quarantined"]).notNullable().defaultTo("in-yard");
    t.string("status_reason", 300).nullable();
    t.integer("crew_id").unsigned().nullable().references("id").inTable("crews");
    t.integer("job_id").unsigned().nullable().references("id").inTable("jobs");
    // Receipt inspection.
    t.boolean("has_damage").notNullable().defaultTo(false);
    t.string("damage_notes", 500).nullable();
    t.decimal("ovality_pct", 5, 2).nullable();
    t.boolean("end_caps_in_place").notNullable().defaultTo(true);
    t.boolean("inspection_passed").notNullable().defaultTo(true);
    t.integer("received_by").unsigned().nullable().references("id").inTable("users");
    t.timestamp("received_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("label_printed_at", { precision: 3 }).nullable();
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.index(["manufacturer", "lot"]);
    t.index(["lot"]);
    t.index(["trace_code"]);
    t.index(["status"]);
  });

  await knex.schema.createTable("coil_events", (t) => {
    t.bigIncrements("id").primary();
    t.integer("coil_id").unsigned().notNullable().references("id").inTable("coils");
    t.timestamp("at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.integer("by_user_id").unsigned().nullable().references("id").inTable("users");
    t.string("from_status", 20).nullable();
    t.string("to_status", 20).notNullable();
    t.string("reason", 300).nullable();
    t.integer("job_id").unsigned().nullable();
    t.integer("crew_id").unsigned().nullable();
    t.index(["coil_id", "at"]);
  });

  await knex.schema.createTable("fusion_machines", (t) => {
    t.increments("id").primary();
    t.string("asset_tag", 40).notNullable().unique();
    t.string("description", 200).nullable();
    t.decimal("min_od_mm", 8, 2).nullable();
    t.decimal("max_od_mm", 8, 2).nullable();
    // Total effective piston area of the carriage cylinders, mm² (null = not yet known: machine unusable).
    t.decimal("piston_area_mm2", 10, 2).nullable();
    t.date("last_service_on").nullable();
    t.date("next_service_due").nullable();
    t.boolean("is_active").notNullable().defaultTo(true);
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });

  await knex.schema.createTable("heater_plates", (t) => {
    t.increments("id").primary();
    t.string("asset_tag", 40).notNullable().unique();
    t.string("description", 200).nullable();
    t.integer("check_interval_days").unsigned().notNullable().defaultTo(1);
    t.boolean("is_active").notNullable().defaultTo(true);
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
  });

  await knex.schema.createTable("heater_checks", (t) => {
    t.bigIncrements("id").primary();
    t.integer("heater_id").unsigned().notNullable().references("id").inTable("heater_plates");
    t.timestamp("checked_at", { precision: 3 }).notNullable();
    t.integer("checked_by").unsigned().nullable().references("id").inTable("users");
    t.string("instrument", 120).notNullable();
    t.text("readings").notNullable(); // JSON { faceA: number[], faceB: number[] } in °C
    t.decimal("window_min_c", 6, 2).notNullable();
    t.decimal("window_max_c", 6, 2).notNullable();
    t.boolean("passed").notNullable();
    t.date("next_due_on").notNullable();
    t.string("notes", 500).nullable();
    t.index(["heater_id", "checked_at"]);
  });

  await knex.schema.createTable("attachments", (t) => {
    t.bigIncrements("id").primary();
    t.string("kind", 40).notNullable(); // bead-photo | pressure-trace | qualification-evidence
    t.string("object_key", 200).notNullable().unique();
    t.string("content_type", 100).notNullable();
    t.integer("size_bytes").unsigned().notNullable();
    t.string("sha256", 64).notNullable();
    t.string("original_name", 200).nullable(); // shown only, never used as a path
    t.bigInteger("joint_id").unsigned().nullable();
    t.integer("uploaded_by").unsigned().nullable().references("id").inTable("users");
    t.timestamp("uploaded_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["joint_id"]);
  });

  await knex.schema.createTable("qualifications", (t) => {
    t.increments("id").primary();
    t.integer("user_id").unsigned().notNullable().references("id").inTable("users");
    t.integer("procedure_id").unsigned().notNullable().references("id").inTable("procedures");
    t.date("qualified_on").notNullable();
    t.enu("method", ["visual-bend", "visual-tensile", "ultrasonic"]).notNullable();
    t.string("specimen_result", 300).notNullable();
    t.string("evaluator", 160).notNullable();
    t.bigInteger("evidence_attachment_id").unsigned().nullable();
    t.integer("recorded_by").unsigned().nullable().references("id").inTable("users");
    t.timestamp("recorded_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["user_id", "procedure_id", "qualified_on"]);
  });

  // Production joints found unacceptable by a §192.513 test: the fuser must requalify.
  await knex.schema.createTable("qualification_failures", (t) => {
    t.increments("id").primary();
    t.integer("user_id").unsigned().notNullable().references("id").inTable("users");
    t.integer("procedure_id").unsigned().notNullable().references("id").inTable("procedures");
    t.date("failed_on").notNullable();
    t.bigInteger("joint_id").unsigned().nullable();
    t.string("notes", 500).nullable();
    t.integer("recorded_by").unsigned().nullable().references("id").inTable("users");
    t.timestamp("recorded_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["user_id", "procedure_id"]);
  });

  await knex.schema.createTable("joints", (t) => {
    t.bigIncrements("id").primary();
    t.string("client_id", 64).notNullable().unique(); // client-generated: a resubmission is idempotent
    t.integer("job_id").unsigned().notNullable().references("id").inTable("jobs");
    t.integer("joint_no").unsigned().notNullable();
    t.enu("kind", ["coil-to-coil", "tie-in", "fitting"]).notNullable();
    t.integer("coil_a_id").unsigned().nullable().references("id").inTable("coils");
    t.integer("coil_b_id").unsigned().nullable().references("id").inTable("coils");
    t.string("component_b_text", 200).nullable(); // fitting or pipe in the ground (tie-in)
    t.decimal("length_a_m", 9, 2).nullable(); // length laid from coil A with this joint
    t.decimal("length_b_m", 9, 2).nullable();
    t.decimal("outside_diameter_mm", 8, 2).notNullable();
    t.decimal("sdr", 6, 2).notNullable();
    t.integer("procedure_version_id").unsigned().notNullable().references("id").inTable("procedure_versions");
    t.integer("machine_id").unsigned().notNullable().references("id").inTable("fusion_machines");
    t.integer("heater_id").unsigned().notNullable().references("id").inTable("heater_plates");
    t.integer("fuser_id").unsigned().notNullable().references("id").inTable("users");
    t.timestamp("made_at", { precision: 3 }).notNullable();
    t.string("station", 120).nullable();
    t.decimal("latitude", 9, 6).nullable();
    t.decimal("longitude", 9, 6).nullable();
    t.decimal("ambient_c", 5, 1).nullable();
    t.enu("shelter", ["none", "windbreak", "tent", "heated-tent"]).nullable();
    // Recorded values (canonical SI).
    t.decimal("heater_temperature_c", 6, 1).nullable();
    t.decimal("drag_pressure_mpa", 8, 4).nullable();
    t.decimal("bead_up_gauge_mpa", 8, 4).nullable();
    t.decimal("fusion_gauge_mpa", 8, 4).nullable();
    t.decimal("bead_mm", 6, 2).nullable();
    t.decimal("heat_soak_s", 8, 1).nullable();
    t.decimal("changeover_s", 8, 1).nullable();
    t.decimal("cooling_s", 8, 1).nullable();
    t.boolean("facing_ok").nullable();
    t.boolean("alignment_ok").nullable();
    t.boolean("bead_rollback_ok").nullable();
    t.boolean("v_groove_ok").nullable();
    t.string("timed_fields", 200).nullable(); // which durations came from the phase timer (rest typed)
    t.text("plan").notNullable(); // JSON snapshot of the pressure plan the joint was checked against
    t.enu("outcome", ["within-limits", "out-of-limits"]).notNullable();
    t.text("findings").notNullable(); // JSON Finding[]
    t.string("finding_parameters", 200).nullable(); // comma list, for filtering
    t.bigInteger("replaces_joint_id").unsigned().nullable(); // the cut-out joint this one remakes
    t.timestamp("recorded_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.unique(["job_id", "joint_no"]);
    t.index(["made_at", "id"]);
    t.index(["job_id", "made_at", "id"]);
    t.index(["fuser_id", "made_at", "id"]);
    t.index(["machine_id", "made_at", "id"]);
    t.index(["outcome", "made_at", "id"]);
    t.index(["coil_a_id"]);
    t.index(["coil_b_id"]);
    t.index(["replaces_joint_id"]);
  });

  await knex.schema.createTable("joint_revisions", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("joint_id").unsigned().notNullable().references("id").inTable("joints");
    t.integer("revision_no").unsigned().notNullable();
    t.enu("kind", ["recorded", "corrected", "accepted", "cut-out", "trace-attached"]).notNullable();
    t.integer("by_user_id").unsigned().notNullable().references("id").inTable("users");
    t.timestamp("at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.text("reason").nullable();
    t.text("changes").nullable(); // JSON of corrected values / decision details
    t.enu("review_state", ["pending-review", "accepted", "cut-out"]).notNullable();
    // Two inspectors deciding at once both try revision_no = n+1: the unique key lets one win.
    t.unique(["joint_id", "revision_no"]);
  });

  // Current state of each joint (projection of its latest revision), for queues and filters.
  await knex.schema.createTable("joint_states", (t) => {
    t.bigInteger("joint_id").unsigned().primary().references("id").inTable("joints");
    t.enu("review_state", ["pending-review", "accepted", "cut-out"]).notNullable();
    t.integer("revision_no").unsigned().notNullable();
    t.enu("outcome", ["within-limits", "out-of-limits"]).notNullable();
    t.timestamp("made_at", { precision: 3 }).notNullable();
    t.bigInteger("replaced_by_joint_id").unsigned().nullable();
    t.timestamp("updated_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["review_state", "outcome", "made_at"]);
  });

  await knex.schema.createTable("mail_outbox", (t) => {
    t.bigIncrements("id").primary();
    t.string("to_address", 254).notNullable();
    t.string("subject", 300).notNullable();
    t.text("body_text").notNullable();
    t.string("kind", 60).notNullable();
    t.string("dedupe_key", 200).nullable().unique();
    t.enu("status", ["queued", "sending", "sent", "failed"]).notNullable().defaultTo("queued");
    t.integer("attempts").unsigned().notNullable().defaultTo(0);
    t.timestamp("next_attempt_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.string("last_error", 500).nullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("sent_at", { precision: 3 }).nullable();
    t.index(["status", "next_attempt_at"]);
  });

  await knex.schema.createTable("exports", (t) => {
    t.bigIncrements("id").primary();
    t.integer("user_id").unsigned().notNullable().references("id").inTable("users");
    t.enu("format", ["xlsx", "csv"]).notNullable();
    t.text("filter").notNullable(); // JSON
    t.enu("status", ["running", "done", "failed"]).notNullable().defaultTo("running");
    t.integer("row_count").unsigned().nullable();
    t.timestamp("started_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("finished_at", { precision: 3 }).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of [
    "exports",
    "mail_outbox",
    "joint_states",
    "joint_revisions",
    "joints",
    "qualification_failures",
    "qualifications",
    "attachments",
    "heater_checks",
    "heater_plates",
    "fusion_machines",
    "coil_events",
    "coils",
    "job_counters",
    "jobs",
    "procedure_versions",
    "procedures",
    "audit_log",
    "sign_in_attempts",
    "users",
    "crews",
  ]) {
    await knex.schema.dropTableIfExists(table);
  }
}
