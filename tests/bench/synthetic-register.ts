// Bulk loader of the benchmark's synthetic register: 1,000,000 joints over 10 years by
// 200 fusers on 50 machines from 20,000 coils (2,000 jobs of 500 joints), written with a
// handful of INSERT … SELECT … WITH RECURSIVE statements (minutes, not hours), on top of
// the demo scenario (its procedures are reused). Every value is a function of the joint's
// sequence number n (CRC32 hashes), so two loads give the same rows. Built in:
//   - one machine ("BM-EXPORT") holds exactly 1 in 10 joints: 100,000 rows to export;
//   - lot "TRACE200" (two coils) is on side A of exactly 200 joints, on no side B: the
//     lot-trace case;
//   - pairs of joints share one made-at instant, so keyset ties are everywhere;
//   - each joint carries the real pressure plan of its procedure, pipe size and machine
//     (domain planButtFusion, computed once per combination), recorded values inside
//     that plan's windows, and for the 8 % out of limits a value outside the window of
//     its finding parameter (no bead finding under the ISO procedure, which sets no bead minimum); a first revision, and a review revision once decided.
import type { Knex } from "knex";
import { FINDINGS_BACKFILL_SQL, FINDINGS_TRIGGER, FINDINGS_TRIGGER_SQL } from "../../database/migrations/20261202000900_register";
import { planButtFusion } from "../../domain/fusion/plan";
import type { ProcedureDefinition } from "../../domain/procedures";

export type SyntheticRegister = {
  joints: number;
  firstJobId: number;
  fuserIds: number[];
  machineIds: number[];
  exportMachineId: number;
  traceLot: string;
  traceManufacturer: string;
  sampleLot: string;
  procedureVersionIds: number[];
  firstMadeAt: Date;
  lastMadeAt: Date;
};

export const BENCH_COUNTS = { joints: 1_000_000, fusers: 200, machines: 50, coils: 20_000, jobs: 2_000, jointsPerJob: 500, lots: 2_000 };
const BASE = "2016-12-01 00:00:00";
/** Seconds between joint pairs: 10 years (315,360,000 s) over 500,000 pairs. */
const PAIR_STEP_S = 630.72;
const MANUFACTURER = "Quillfield Polymers";

async function seq(k: Knex, n: number, sql: string): Promise<void> {
  await k.raw(`SET SESSION max_recursive_iterations = ${Math.max(n + 10, 1000)}`);
  await k.raw(sql);
}

async function firstId(k: Knex, table: string, where: string): Promise<number> {
  const [rows] = (await k.raw(`SELECT MIN(id) AS id FROM ${table} WHERE ${where}`)) as unknown as [{ id: number }[]];
  return Number(rows[0].id);
}

/**
 * Loads the synthetic register with the owner connection `k` (migrated schema, demo
 * scenario loaded). `log` hears progress. Returns the ids and names the measurements use.
 */
export async function loadSyntheticRegister(k: Knex, { joints = BENCH_COUNTS.joints, log = console.log }: { joints?: number; log?: (line: string) => void } = {}): Promise<SyntheticRegister> {
  const c = { ...BENCH_COUNTS, joints, jobs: Math.ceil(joints / BENCH_COUNTS.jointsPerJob) };
  const [pvRows] = (await k.raw("SELECT id FROM procedure_versions ORDER BY id LIMIT 2")) as unknown as [{ id: number }[]];
  const pv = pvRows.map((r) => Number(r.id));
  if (pv.length < 1) throw new Error("The demo scenario must be loaded first (its procedures are reused).");
  const pv2 = pv[1] ?? pv[0];
  const [procRows] = (await k.raw("SELECT procedure_id FROM procedure_versions WHERE id = ?", [pv[0]])) as unknown as [{ procedure_id: number }[]];
  const procedureId = Number(procRows[0].procedure_id);

  log(`people, machines, heater plates, coils, jobs …`);
  await seq(
    k,
    c.fusers,
    `INSERT INTO users (name, email, password_hash, roles, unit_system)
     WITH RECURSIVE s(n) AS (SELECT 1 UNION ALL SELECT n + 1 FROM s WHERE n < ${c.fusers})
     SELECT CONCAT('Bench fuser ', LPAD(n, 3, '0')), CONCAT('bench-fuser-', n, '@bench.example'), '!bench-account-cannot-sign-in', 'fuser', IF(n % 2 = 0, 'us', 'si') FROM s`,
  );
  const firstFuser = await firstId(k, "users", "email LIKE 'bench-fuser-%'");
  await seq(
    k,
    c.machines,
    `INSERT INTO fusion_machines (asset_tag, description, min_od_mm, max_od_mm, piston_area_mm2)
     WITH RECURSIVE s(n) AS (SELECT 1 UNION ALL SELECT n + 1 FROM s WHERE n < ${c.machines})
     SELECT IF(n = 1, 'BM-EXPORT', CONCAT('BM-', LPAD(n, 3, '0'))), 'Bench machine', 40, 330, 900 + n * 10 FROM s`,
  );
  const firstMachine = await firstId(k, "fusion_machines", "asset_tag LIKE 'BM-%'");
  await seq(
    k,
    c.machines,
    `INSERT INTO heater_plates (asset_tag, description, check_interval_days)
     WITH RECURSIVE s(n) AS (SELECT 1 UNION ALL SELECT n + 1 FROM s WHERE n < ${c.machines})
     SELECT CONCAT('BH-', LPAD(n, 3, '0')), 'Bench heater plate', 1 FROM s`,
  );
  const firstHeater = await firstId(k, "heater_plates", "asset_tag LIKE 'BH-%'");
  // Coil k (0-based): size k % 3, lot L(k % 2000); the last two coils make lot TRACE200.
  await seq(
    k,
    c.coils,
    `INSERT INTO coils (coil_code, manufacturer, manufacturer_code, lot, material, series, nominal_size, outside_diameter_mm, sdr, length_m, remaining_m, status)
     WITH RECURSIVE s(n) AS (SELECT 0 UNION ALL SELECT n + 1 FROM s WHERE n < ${c.coils - 1})
     SELECT CONCAT('BC-', LPAD(n, 5, '0')), '${MANUFACTURER}', 'QF',
            IF(n >= ${c.coils - 2}, 'TRACE200', CONCAT('L', LPAD(n % ${c.lots}, 5, '0'))),
            'PE4710', 'ips', ELT(n % 3 + 1, '2', '4', '6'), ELT(n % 3 + 1, 60.33, 114.3, 168.28), 11, 152.4, 0, 'used-up' FROM s`,
  );
  const firstCoil = await firstId(k, "coils", "coil_code LIKE 'BC-%'");
  const ordinary = c.coils - 2;
  await seq(
    k,
    c.jobs,
    `INSERT INTO jobs (code, name, place, status, procedure_id)
     WITH RECURSIVE s(n) AS (SELECT 1 UNION ALL SELECT n + 1 FROM s WHERE n < ${c.jobs})
     SELECT CONCAT('BJ-', LPAD(n, 5, '0')), CONCAT('Bench job ', n), CONCAT('Bench street ', n), 'closed', ${procedureId} FROM s`,
  );
  const firstJob = await firstId(k, "jobs", "code LIKE 'BJ-%'");
  await k.raw(`INSERT INTO job_counters (job_id, last_joint_no) SELECT id, ${c.jointsPerJob} FROM jobs WHERE code LIKE 'BJ-%'`);

  // The pressure plan of every (procedure version, pipe size, machine) combination, with
  // the windows the recorded values are drawn from. A helper table for the load only.
  log("pressure plans …");
  const [defs] = (await k.raw(`SELECT id, definition FROM procedure_versions WHERE id IN (${[...new Set([pv[0], pv2])].join(",")})`)) as unknown as [{ id: number; definition: string }[]];
  const [machines] = (await k.raw("SELECT id, piston_area_mm2 FROM fusion_machines WHERE asset_tag LIKE 'BM-%' ORDER BY id")) as unknown as [{ id: number; piston_area_mm2: number }[]];
  await k.raw("DROP TABLE IF EXISTS bench_plans");
  await k.raw(`CREATE TABLE bench_plans (pv_id INT UNSIGNED, size_idx INT, machine_id INT UNSIGNED, plan MEDIUMTEXT, drag DECIMAL(8,4),
    hmin DOUBLE, hmax DOUBLE, gmin DOUBLE, gmax DOUBLE, bumin DOUBLE, bumax DOUBLE, bead_min DOUBLE, co_max DOUBLE, cool_min DOUBLE, hs_min DOUBLE, hs_max DOUBLE,
    PRIMARY KEY (pv_id, size_idx, machine_id))`);
  const sizes = [60.33, 114.3, 168.28];
  const planRows: Record<string, unknown>[] = [];
  for (const d of defs) {
    const definition = JSON.parse(d.definition) as ProcedureDefinition;
    for (const [sizeIdx, od] of sizes.entries()) {
      for (const [i, m] of machines.entries()) {
        const drag = 0.05 + (i % 10) / 100;
        const plan = planButtFusion({ procedure: definition, outsideDiameterMm: od, sdr: 11, pistonAreaMm2: Number(m.piston_area_mm2), dragPressureMpa: drag });
        planRows.push({
          pv_id: d.id,
          size_idx: sizeIdx,
          machine_id: m.id,
          plan: JSON.stringify(plan),
          drag,
          hmin: plan.heaterTemperatureC.min,
          hmax: plan.heaterTemperatureC.max,
          gmin: plan.fusionGaugePressureMpa.min,
          gmax: plan.fusionGaugePressureMpa.max,
          bumin: plan.beadUpGaugePressureMpa.min,
          bumax: plan.beadUpGaugePressureMpa.max,
          bead_min: plan.minBeadMm ?? 1,
          co_max: plan.maxChangeoverS ?? 10,
          cool_min: plan.minCoolingS ?? 300,
          hs_min: plan.heatSoakS?.min ?? null,
          hs_max: plan.heatSoakS?.max ?? null,
        });
      }
    }
  }
  for (let i = 0; i < planRows.length; i += 100) await k("bench_plans").insert(planRows.slice(i, i + 100));

  // The findings trigger is set aside during the bulk load (one statement fills
  // joint_findings afterwards, as the migration's backfill does), then put back.
  await k.raw(`DROP TRIGGER IF EXISTS ${FINDINGS_TRIGGER}`);

  // Joints in chunks of 100,000 (bounded undo log, progress to show). Hash h(tag) = CRC32(CONCAT(tag, n)).
  const chunk = 100_000;
  const started = Date.now();
  for (let from = 1; from <= c.joints; from += chunk) {
    const to = Math.min(c.joints, from + chunk - 1);
    const coilA = `IF(n % 5000 = 0, ${firstCoil + ordinary} + (n DIV 5000) % 2, ${firstCoil} + CRC32(CONCAT('a', n)) % ${ordinary})`;
    await seq(
      k,
      to - from + 1,
      `INSERT INTO joints (client_id, job_id, joint_no, kind, coil_a_id, coil_b_id, component_b_text, outside_diameter_mm, sdr,
         procedure_version_id, machine_id, heater_id, fuser_id, made_at, station, latitude, longitude, ambient_c, shelter,
         heater_temperature_c, drag_pressure_mpa, bead_up_gauge_mpa, fusion_gauge_mpa, bead_mm, heat_soak_s, changeover_s, cooling_s,
         facing_ok, alignment_ok, bead_rollback_ok, v_groove_ok, plan, outcome, findings, finding_parameters)
       WITH RECURSIVE s(n) AS (SELECT ${from} UNION ALL SELECT n + 1 FROM s WHERE n < ${to})
       SELECT CONCAT('bench-', n),
         ${firstJob} + (n - 1) DIV ${c.jointsPerJob}, (n - 1) % ${c.jointsPerJob} + 1,
         kind, coil_a, IF(kind = 'coil-to-coil', ${firstCoil} + CRC32(CONCAT('b', n)) % ${ordinary}, NULL),
         IF(kind = 'tie-in', 'Existing main, PE', IF(kind = 'fitting', 'Tee', NULL)),
         ELT(x.size_idx + 1, 60.33, 114.3, 168.28), 11,
         pv, machine, ${firstHeater} + (machine - ${firstMachine}),
         ${firstFuser} + CRC32(CONCAT('f', n)) % ${c.fusers},
         TIMESTAMPADD(MICROSECOND, FLOOR(((n - 1) DIV 2) * ${PAIR_STEP_S} * 1000) * 1000, '${BASE}'),
         CONCAT(n % 100, '+', LPAD(n % 97, 2, '0')), 41.1 + (CRC32(CONCAT('y', n)) % 200000) / 1000000, -77.3 + (CRC32(CONCAT('x', n)) % 200000) / 1000000,
         -10 + (CRC32(CONCAT('c', n)) % 400) / 10, ELT(n % 4 + 1, 'none', 'windbreak', 'tent', 'heated-tent'),
         IF(FIND_IN_SET('heaterTemperature', finding), bp.hmax + 8, bp.hmin + (bp.hmax - bp.hmin) * (0.2 + frac * 0.6)),
         bp.drag,
         bp.bumin + (bp.bumax - bp.bumin) * (0.2 + frac * 0.6),
         IF(FIND_IN_SET('fusionPressure', finding), bp.gmax * 1.3, bp.gmin + (bp.gmax - bp.gmin) * (0.2 + frac * 0.6)),
         IF(FIND_IN_SET('bead', finding), bp.bead_min * 0.4, bp.bead_min + 0.5 + frac * 2),
         IF(bp.hs_min IS NULL, NULL, (bp.hs_min + bp.hs_max) / 2),
         IF(FIND_IN_SET('changeover', finding), bp.co_max + 4, GREATEST(1, bp.co_max * (0.3 + frac * 0.5))),
         IF(FIND_IN_SET('cooling', finding), bp.cool_min * 0.5, bp.cool_min * (1.1 + frac)),
         1, 1, 1, 1, bp.plan,
         IF(finding IS NULL, 'within-limits', 'out-of-limits'),
         '[]',
         finding
       FROM (
         SELECT n, coil_a, machine, kind, (coil_a - ${firstCoil}) % 3 AS size_idx, IF(n % 7 = 0, ${pv2}, ${pv[0]}) AS pv,
           (CRC32(CONCAT('v', n)) % 1000) / 1000 AS frac,
           IF(out_roll < 8, ELT(CRC32(CONCAT('p', n)) % 5 + 1, 'cooling', 'heaterTemperature', IF(n % 7 = 0, 'changeover', 'bead'), 'changeover', 'fusionPressure,cooling'), NULL) AS finding
         FROM (
           SELECT n,
             ${coilA} AS coil_a,
             IF(n % 10 = 0, ${firstMachine}, ${firstMachine} + 1 + CRC32(CONCAT('m', n)) % ${c.machines - 1}) AS machine,
             ELT(IF(CRC32(CONCAT('k', n)) % 100 < 80, 1, IF(CRC32(CONCAT('k', n)) % 100 < 92, 2, 3)), 'coil-to-coil', 'tie-in', 'fitting') AS kind,
             CRC32(CONCAT('o', n)) % 100 AS out_roll
           FROM s
         ) y
       ) x JOIN bench_plans bp ON bp.pv_id = x.pv AND bp.size_idx = x.size_idx AND bp.machine_id = x.machine`,
    );
    log(`joints ${to.toLocaleString("en-US")} of ${c.joints.toLocaleString("en-US")} (${((Date.now() - started) / 1000).toFixed(0)} s)`);
  }
  await k.raw("DROP TABLE IF EXISTS bench_plans");
  log("joint findings …");
  await k.raw(FINDINGS_BACKFILL_SQL);
  await k.raw(FINDINGS_TRIGGER_SQL);
  log("joint states and revisions …");
  const inspector = await k("users").whereRaw("FIND_IN_SET('inspector', roles) > 0").orderBy("id").first("id");
  await k.raw(`INSERT INTO joint_states (joint_id, review_state, revision_no, outcome, made_at)
     SELECT id, state, IF(state = 'pending-review', 1, 2), outcome, made_at FROM (
       SELECT id, outcome, made_at, IF(outcome = 'out-of-limits', ELT(id % 3 + 1, 'pending-review', 'accepted', 'cut-out'), IF(id % 10 = 0, 'pending-review', 'accepted')) AS state
       FROM joints WHERE client_id LIKE 'bench-%') x`);
  await k.raw(`INSERT INTO joint_revisions (joint_id, revision_no, kind, by_user_id, at, review_state)
     SELECT id, 1, 'recorded', fuser_id, made_at, 'pending-review' FROM joints WHERE client_id LIKE 'bench-%'`);
  await k.raw(`INSERT INTO joint_revisions (joint_id, revision_no, kind, by_user_id, at, reason, review_state)
     SELECT s.joint_id, 2, IF(s.review_state = 'accepted', 'accepted', 'cut-out'), ${Number(inspector?.id ?? firstFuser)}, TIMESTAMPADD(HOUR, 2, s.made_at), 'Bench review', s.review_state
     FROM joint_states s JOIN joints j ON j.id = s.joint_id WHERE j.client_id LIKE 'bench-%' AND s.review_state <> 'pending-review'`);
  log("statistics …");
  for (const t of ["joints", "joint_states", "joint_findings", "joint_revisions", "coils", "jobs", "users"]) await k.raw(`ANALYZE TABLE ${t}`);

  const [range] = (await k.raw("SELECT MIN(made_at) AS a, MAX(made_at) AS b FROM joints WHERE client_id LIKE 'bench-%'")) as unknown as [{ a: Date; b: Date }[]];
  return {
    joints: c.joints,
    firstJobId: firstJob,
    fuserIds: Array.from({ length: c.fusers }, (_, i) => firstFuser + i),
    machineIds: Array.from({ length: c.machines }, (_, i) => firstMachine + i),
    exportMachineId: firstMachine,
    traceLot: "TRACE200",
    traceManufacturer: MANUFACTURER,
    sampleLot: "L00042",
    procedureVersionIds: pv,
    firstMadeAt: range[0].a,
    lastMadeAt: range[0].b,
  };
}
