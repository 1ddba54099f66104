// Loads the invented demo scenario (fixtures/demo-scenario.ts) into an empty database.
// `npm start` runs it only when the users table is empty; tests never touch the demo database.
import bcrypt from "bcryptjs";
import { BCRYPT_COST } from "@/domain/crew/password-policy";
import type { Knex } from "knex";
import { builtInProcedure } from "@/domain/procedures";
import {
  DEMO_COILS,
  DEMO_CREWS,
  DEMO_HEATERS,
  DEMO_JOBS,
  DEMO_MACHINES,
  DEMO_MANUFACTURER,
  DEMO_PASSWORD,
  DEMO_PEOPLE,
  DEMO_PROCEDURES,
  DEMO_QUALIFICATIONS,
  isoDaysFrom,
} from "@/fixtures/demo-scenario";

export async function seed(knex: Knex, today = new Date()): Promise<void> {
  await knex.transaction(async (trx) => {
    const crewIds = new Map<string, number>();
    for (const crew of DEMO_CREWS) {
      const [id] = await trx("crews").insert(crew);
      crewIds.set(crew.name, Number(id));
    }
    const hash = await bcrypt.hash(DEMO_PASSWORD, BCRYPT_COST); // the same cost as real passwords
    const userIds = new Map<string, number>();
    for (const p of DEMO_PEOPLE) {
      const [id] = await trx("users").insert({ name: p.name, email: p.email, password_hash: hash, roles: p.roles.join(","), unit_system: p.unitSystem, crew_id: p.crew ? crewIds.get(p.crew) : null });
      userIds.set(p.key, Number(id));
    }
    const procedureIds = new Map<string, number>();
    for (const p of DEMO_PROCEDURES) {
      const [id] = await trx("procedures").insert({ code: p.code, name: p.name, standard: p.standard });
      procedureIds.set(p.code, Number(id));
      await trx("procedure_versions").insert({
        procedure_id: id,
        version_no: 1,
        definition: JSON.stringify(builtInProcedure(p.standard)),
        notes: "First version: the published standard's windows, not tightened.",
        published_by: userIds.get("admin"),
      });
    }
    const jobIds = new Map<string, number>();
    for (const j of DEMO_JOBS) {
      const [id] = await trx("jobs").insert({
        code: j.code,
        name: j.name,
        place: j.place,
        latitude: j.latitude,
        longitude: j.longitude,
        starts_on: isoDaysFrom(today, j.startsInDays),
        status: "open",
        procedure_id: procedureIds.get(j.procedure),
        crew_id: crewIds.get(j.crew),
        pipe_sizes: j.pipeSizes,
      });
      jobIds.set(j.code, Number(id));
      await trx("job_counters").insert({ job_id: id, last_joint_no: 0 });
    }
    for (const c of DEMO_COILS) {
      const [id] = await trx("coils").insert({
        coil_code: c.coilCode,
        manufacturer: DEMO_MANUFACTURER.name,
        manufacturer_code: DEMO_MANUFACTURER.code,
        lot: c.lot,
        production_date: c.productionDate,
        material: c.material,
        series: c.series,
        nominal_size: c.nominalSize,
        outside_diameter_mm: c.outsideDiameterMm,
        sdr: c.sdr,
        length_m: c.lengthM,
        remaining_m: c.status === "used-up" ? 0 : c.lengthM,
        print_line: `${DEMO_MANUFACTURER.name.toUpperCase()} ${c.nominalSize}" IPS SDR ${c.sdr} ${c.material} GAS ASTM D2513 LOT ${c.lot} ${c.productionDate}`,
        status: c.status,
        status_reason: c.statusReason ?? null,
        crew_id: c.crew ? crewIds.get(c.crew) : null,
        job_id: c.job ? jobIds.get(c.job) : null,
        has_damage: c.status === "quarantined",
        damage_notes: c.statusReason ?? null,
        ovality_pct: 2.1,
        end_caps_in_place: true,
        inspection_passed: c.status !== "quarantined",
        received_by: userIds.get("clerk"),
        received_at: new Date(`${c.productionDate}T12:00:00Z`),
        label_printed_at: c.coilCode === "LV-C0011" ? null : new Date(`${c.productionDate}T13:00:00Z`),
      });
      await trx("coil_events").insert({ coil_id: id, by_user_id: userIds.get("clerk"), from_status: null, to_status: c.status, reason: c.statusReason ?? "Received" });
    }
    for (const m of DEMO_MACHINES) {
      await trx("fusion_machines").insert({
        asset_tag: m.assetTag,
        description: m.description,
        min_od_mm: m.minOdMm,
        max_od_mm: m.maxOdMm,
        piston_area_mm2: m.pistonAreaMm2,
        last_service_on: isoDaysFrom(today, m.serviceInDays),
        next_service_due: isoDaysFrom(today, m.serviceInDays + 365),
      });
    }
    // A passing surface-temperature check each working morning for the last three weeks, so
    // every demo joint has a check on file before it (HP-12's latest is a few days old: overdue).
    for (const h of DEMO_HEATERS) {
      const [id] = await trx("heater_plates").insert({ asset_tag: h.assetTag, description: h.description, check_interval_days: h.checkIntervalDays });
      for (let daysAgo = 21; daysAgo >= h.lastCheckDaysAgo; daysAgo--) {
        const checkedOn = isoDaysFrom(today, -daysAgo);
        const shift = daysAgo % 3; // small day-to-day spread of the readings, °C
        await trx("heater_checks").insert({
          heater_id: id,
          checked_at: new Date(`${checkedOn}T06:30:00Z`),
          checked_by: userIds.get("admin"),
          instrument: "Contact pyrometer PY-4",
          readings: JSON.stringify({ faceA: h.readingsC.slice(0, 3).map((r) => r - shift), faceB: h.readingsC.slice(3).map((r) => r - shift) }),
          window_min_c: 204.4,
          window_max_c: 232.2,
          passed: true,
          next_due_on: isoDaysFrom(today, -daysAgo + h.checkIntervalDays),
        });
      }
    }
    for (const q of DEMO_QUALIFICATIONS) {
      await trx("qualifications").insert({
        user_id: userIds.get(q.person),
        procedure_id: procedureIds.get(q.procedure),
        qualified_on: isoDaysFrom(today, -q.daysAgo),
        method: q.method,
        specimen_result: "Specimen joint acceptable: visual per procedure, test passed",
        evaluator: "Dana Pellworth",
        recorded_by: userIds.get("admin"),
      });
    }
    await trx("audit_log").insert({ actor_user_id: null, action: "demo-loaded", entity_type: "database", entity_id: null, details: JSON.stringify({ today: isoDaysFrom(today, 0) }) });
  });
}
