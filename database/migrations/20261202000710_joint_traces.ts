// Pressure traces read for a joint: which uploaded file (attachments, kind pressure-trace),
// the phases and values the reader found, the chart points, and the check of those values
// against the joint's plan. One row per upload; the newest is the one shown. Rows are
// never changed: a second upload is a new row and a new joint revision.
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("joint_traces", (t) => {
    t.bigIncrements("id").primary();
    t.bigInteger("joint_id").unsigned().notNullable().references("id").inTable("joints");
    t.bigInteger("attachment_id").unsigned().notNullable().references("id").inTable("attachments");
    t.integer("revision_no").unsigned().notNullable(); // the joint revision that attached it
    t.integer("sample_count").unsigned().notNullable();
    t.enu("pressure_unit", ["mpa", "psi"]).notNullable(); // unit of the file (stored values are MPa)
    t.text("reading").notNullable(); // JSON PressureTraceReading (s, MPa, °C)
    t.text("chart", "mediumtext").notNullable(); // JSON ChartPoint[] (downsampled)
    t.enu("outcome", ["within-limits", "out-of-limits"]).notNullable();
    t.text("findings").notNullable(); // JSON JointFinding[] on the trace's parameters
    t.string("finding_parameters", 200).nullable();
    t.integer("uploaded_by").unsigned().notNullable().references("id").inTable("users");
    t.timestamp("uploaded_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["joint_id", "id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("joint_traces");
}
