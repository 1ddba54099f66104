// The Register at utility scale: indexes that match its filters and sorts, so every page
// is an index range walk (keyset pagination, no OFFSET), and joint_findings, one row per
// finding parameter of a joint, so "joints with a cooling finding" is an index seek
// instead of a scan over the comma list in joints.finding_parameters.
//
// joint_findings is filled by a trigger on joints, so every way a joint is inserted (the
// Trench, the API, seeds, bulk loads) keeps it in step without the writer knowing about
// it. It holds the findings of the check made when the joint was recorded; made_at is
// copied so a filtered page can be read in date order from this table's own index.
// (With binary logging on, creating a trigger needs SUPER or log_bin_trust_function_creators=1.)
import type { Knex } from "knex";

export const FINDINGS_TRIGGER = "joints_ai_findings";
const TRIGGER = FINDINGS_TRIGGER;

/** The trigger that splits joints.finding_parameters into joint_findings rows. */
export const FINDINGS_TRIGGER_SQL = `
    CREATE TRIGGER ${FINDINGS_TRIGGER} AFTER INSERT ON joints FOR EACH ROW
    BEGIN
      DECLARE rest VARCHAR(400) DEFAULT IFNULL(NEW.finding_parameters, '');
      DECLARE item VARCHAR(400);
      WHILE rest <> '' DO
        SET item = TRIM(SUBSTRING_INDEX(rest, ',', 1));
        IF item <> '' THEN
          INSERT IGNORE INTO joint_findings (joint_id, parameter, made_at) VALUES (NEW.id, LEFT(item, 40), NEW.made_at);
        END IF;
        IF LOCATE(',', rest) = 0 THEN
          SET rest = '';
        ELSE
          SET rest = SUBSTRING(rest, LOCATE(',', rest) + 1);
        END IF;
      END WHILE;
    END`;

/** Fills joint_findings for joints already in the table (bulk loads run it with the trigger off). */
export const FINDINGS_BACKFILL_SQL = `
    INSERT IGNORE INTO joint_findings (joint_id, parameter, made_at)
    SELECT j.id, LEFT(TRIM(f.p), 40), j.made_at
    FROM joints j,
      JSON_TABLE(CONCAT('["', REPLACE(j.finding_parameters, ',', '","'), '"]'), '$[*]' COLUMNS (p VARCHAR(400) PATH '$')) f
    WHERE j.finding_parameters IS NOT NULL AND j.finding_parameters <> '' AND TRIM(f.p) <> ''`;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("joint_findings", (t) => {
    t.bigInteger("joint_id").unsigned().notNullable().references("id").inTable("joints");
    t.string("parameter", 40).notNullable();
    t.timestamp("made_at", { precision: 3 }).notNullable();
    t.primary(["joint_id", "parameter"]);
    t.index(["parameter", "made_at", "joint_id"], "joint_findings_parameter_made_at_index");
  });

  await knex.raw(FINDINGS_TRIGGER_SQL);
  // Joints recorded before this migration.
  await knex.raw(FINDINGS_BACKFILL_SQL);

  await knex.schema.alterTable("joints", (t) => {
    // Sorts of the register without a filter in front (pipe size, heater temperature).
    t.index(["outside_diameter_mm", "sdr", "id"], "joints_register_pipe_size_index");
    t.index(["heater_temperature_c", "id"], "joints_register_heater_temperature_index");
    // Search by joint number across jobs ("12" finds joint 12 of every job).
    t.index(["joint_no"], "joints_register_joint_no_index");
  });

  await knex.schema.alterTable("joint_states", (t) => {
    // Outcome or review state alone, newest first (the core index leads with both).
    t.index(["outcome", "made_at", "joint_id"], "joint_states_outcome_made_at_index");
    t.index(["review_state", "made_at", "joint_id"], "joint_states_review_made_at_index");
  });

  await knex.schema.alterTable("exports", (t) => {
    t.index(["user_id", "started_at"], "exports_user_started_index");
  });
}

export async function down(knex: Knex): Promise<void> {
  // InnoDB dropped the foreign key's own index when the wider one came: put it back first.
  await knex.schema.alterTable("exports", (t) => {
    t.index(["user_id"], "exports_user_id_foreign");
  });
  await knex.schema.alterTable("exports", (t) => {
    t.dropIndex(["user_id", "started_at"], "exports_user_started_index");
  });
  await knex.schema.alterTable("joint_states", (t) => {
    t.dropIndex(["outcome", "made_at", "joint_id"], "joint_states_outcome_made_at_index");
    t.dropIndex(["review_state", "made_at", "joint_id"], "joint_states_review_made_at_index");
  });
  await knex.schema.alterTable("joints", (t) => {
    t.dropIndex(["outside_diameter_mm", "sdr", "id"], "joints_register_pipe_size_index");
    t.dropIndex(["heater_temperature_c", "id"], "joints_register_heater_temperature_index");
    t.dropIndex(["joint_no"], "joints_register_joint_no_index");
  });
  await knex.raw(`DROP TRIGGER IF EXISTS ${TRIGGER}`);
  await knex.schema.dropTableIfExists("joint_findings");
}
