// Coils: the lot field of the ASTM F2897 code (positions 3–6, the lot number in base 62;
// ASTM F2897-23a Table 1), kept as a generated, indexed column so a recall by lot finds a
// coil by the lot its code carries as well as by its typed lot, without reading every coil.
// Binary collation: base-62 digits differ by case ("a" is 10, "A" is 36).
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.raw(
    "ALTER TABLE coils ADD COLUMN trace_code_lot VARCHAR(4) CHARACTER SET utf8mb4 COLLATE utf8mb4_bin AS (SUBSTRING(trace_code, 3, 4)) PERSISTENT, ADD INDEX coils_trace_code_lot_index (trace_code_lot)",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("ALTER TABLE coils DROP INDEX coils_trace_code_lot_index, DROP COLUMN trace_code_lot");
}
