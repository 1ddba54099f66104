// Row types of the tables, as database/migrations create them and as mysql2 returns them
// with the options of knexfile.js: DECIMAL → number (decimalNumbers), TINYINT(1) and
// INT → number, BIGINT → number (safe range; supportBigNumbers), DATETIME/TIMESTAMP and
// DATE → Date (dateStrings off, timezone Z: a DATE is UTC midnight), TEXT and JSON text
// → string, ENUM and SET → string. The query modules name the rows they read with these
// types (joined columns added as `& { crew_name: string | null }`) and turn them into
// domain objects through database/queries/rows.ts.

import type { UnitSystem } from "@/domain/units/format";
import type { MailGrouping } from "@/domain/mail/grouping";
/** TINYINT(1) as read: 0 or 1. */
export type Tinyint = number;

export type CrewRow = { id: number; name: string; trailer: string | null; is_active: Tinyint; created_at: Date };

export type UserRow = {
  id: number;
  name: string;
  email: string;
  password_hash: string;
  /** SET-like comma list of fuser,inspector,clerk,admin. */
  roles: string;
  unit_system: UnitSystem;
  is_active: Tinyint;
  session_version: number;
  crew_id: number | null;
  mail_grouping: MailGrouping;
  version: number;
  created_at: Date;
  updated_at: Date;
};

export type SignInAttemptRow = { id: number; email: string; address: string; succeeded: Tinyint; attempted_at: Date };

export type AuditLogRow = {
  id: number;
  at: Date;
  actor_user_id: number | null;
  action: string;
  entity_type: string;
  entity_id: string | null;
  /** JSON text. */
  details: string | null;
  request_id: string | null;
};

export type ProcedureRow = { id: number; code: string; name: string; standard: string; is_active: Tinyint; created_at: Date };

export type ProcedureVersionRow = {
  id: number;
  procedure_id: number;
  version_no: number;
  /** JSON ProcedureDefinition. */
  definition: string;
  notes: string | null;
  published_by: number | null;
  published_at: Date;
  superseded_at: Date | null;
};

export type JobRow = {
  id: number;
  code: string;
  name: string;
  place: string | null;
  latitude: number | null;
  longitude: number | null;
  starts_on: Date | null;
  ends_on: Date | null;
  status: "open" | "closed";
  procedure_id: number;
  crew_id: number | null;
  pipe_sizes: string | null;
  version: number;
  created_at: Date;
  updated_at: Date;
};

export type JobCounterRow = { job_id: number; last_joint_no: number };

export type CoilTableRow = {
  id: number;
  coil_code: string;
  manufacturer: string;
  manufacturer_code: string | null;
  lot: string;
  production_date: Date | null;
  material: string;
  series: "ips" | "cts" | "metric";
  nominal_size: string;
  outside_diameter_mm: number;
  sdr: number;
  length_m: number;
  remaining_m: number;
  print_line: string | null;
  trace_code: string | null;
  status: "in-yard" | "on-trailer" | "in-use" | "used-up" | "quarantined";
  status_reason: string | null;
  crew_id: number | null;
  job_id: number | null;
  has_damage: Tinyint;
  damage_notes: string | null;
  ovality_pct: number | null;
  end_caps_in_place: Tinyint;
  inspection_passed: Tinyint;
  received_by: number | null;
  received_at: Date;
  label_printed_at: Date | null;
  version: number;
  /** Comma list of gouge,kink,flattening. */
  damage_kinds: string | null;
  gouge_depth_mm: number | null;
  gouge_limit_pct: number | null;
  ovality_limit_pct: number | null;
  /** JSON [{ field, message }]. */
  trace_code_flags: string | null;
};

export type CoilEventRow = {
  id: number;
  coil_id: number;
  at: Date;
  by_user_id: number | null;
  from_status: string | null;
  to_status: string;
  reason: string | null;
  job_id: number | null;
  crew_id: number | null;
  pull_m: number | null;
  remaining_m: number | null;
  joint_id: number | null;
};

export type FusionMachineRow = {
  id: number;
  asset_tag: string;
  description: string | null;
  min_od_mm: number | null;
  max_od_mm: number | null;
  piston_area_mm2: number | null;
  gauge_resolution_mpa: number | null;
  thermometer_resolution_c: number | null;
  last_service_on: Date | null;
  next_service_due: Date | null;
  is_active: Tinyint;
  version: number;
  created_at: Date;
};

export type HeaterPlateRow = {
  id: number;
  asset_tag: string;
  description: string | null;
  check_interval_days: number;
  is_active: Tinyint;
  version: number;
  created_at: Date;
};

export type HeaterCheckRow = {
  id: number;
  heater_id: number;
  checked_at: Date;
  checked_by: number | null;
  instrument: string;
  /** JSON { faceA: number[], faceB: number[] } in °C. */
  readings: string;
  window_min_c: number;
  window_max_c: number;
  passed: Tinyint;
  next_due_on: Date;
  notes: string | null;
  procedure_version_id: number | null;
};

export type AttachmentRow = {
  id: number;
  kind: string;
  object_key: string;
  content_type: string;
  size_bytes: number;
  sha256: string;
  original_name: string | null;
  joint_id: number | null;
  uploaded_by: number | null;
  uploaded_at: Date;
};

export type QualificationRow = {
  id: number;
  user_id: number;
  procedure_id: number;
  qualified_on: Date;
  method: "visual-bend" | "visual-tensile" | "ultrasonic";
  specimen_result: string;
  evaluator: string;
  evidence_attachment_id: number | null;
  recorded_by: number | null;
  recorded_at: Date;
};

export type QualificationFailureRow = {
  id: number;
  user_id: number;
  procedure_id: number;
  failed_on: Date;
  joint_id: number | null;
  notes: string | null;
  recorded_by: number | null;
  recorded_at: Date;
};

export type JointRow = {
  id: number;
  client_id: string;
  job_id: number;
  joint_no: number;
  kind: "coil-to-coil" | "tie-in" | "fitting";
  coil_a_id: number | null;
  coil_b_id: number | null;
  component_b_text: string | null;
  length_a_m: number | null;
  length_b_m: number | null;
  outside_diameter_mm: number;
  sdr: number;
  procedure_version_id: number;
  machine_id: number;
  heater_id: number;
  fuser_id: number;
  made_at: Date;
  station: string | null;
  latitude: number | null;
  longitude: number | null;
  ambient_c: number | null;
  shelter: "none" | "windbreak" | "tent" | "heated-tent" | null;
  heater_temperature_c: number | null;
  heater_surface_temperature_c: number | null;
  misalignment_mm: number | null;
  drag_pressure_mpa: number | null;
  bead_up_gauge_mpa: number | null;
  fusion_gauge_mpa: number | null;
  bead_mm: number | null;
  heat_soak_s: number | null;
  changeover_s: number | null;
  cooling_s: number | null;
  facing_ok: Tinyint | null;
  alignment_ok: Tinyint | null;
  bead_rollback_ok: Tinyint | null;
  v_groove_ok: Tinyint | null;
  /** Comma list. */
  timed_fields: string | null;
  /** JSON plan snapshot. */
  plan: string;
  outcome: "within-limits" | "out-of-limits";
  /** JSON Finding[]. */
  findings: string;
  /** Comma list. */
  finding_parameters: string | null;
  replaces_joint_id: number | null;
  recorded_at: Date;
  /** SHA-256 hex of the recording submission's canonical text; null on joints recorded before. */
  submission_sha256: string | null;
};

export type JointRevisionRow = {
  id: number;
  joint_id: number;
  revision_no: number;
  kind: "recorded" | "corrected" | "accepted" | "cut-out" | "trace-attached";
  by_user_id: number;
  at: Date;
  reason: string | null;
  /** JSON. */
  changes: string | null;
  review_state: "pending-review" | "accepted" | "cut-out";
};

export type JointStateRow = {
  joint_id: number;
  review_state: "pending-review" | "accepted" | "cut-out";
  revision_no: number;
  outcome: "within-limits" | "out-of-limits";
  made_at: Date;
  replaced_by_joint_id: number | null;
  updated_at: Date;
};

export type MailOutboxRow = {
  id: number;
  to_address: string;
  subject: string;
  body_text: string;
  kind: string;
  dedupe_key: string | null;
  status: "queued" | "sending" | "sent" | "failed";
  attempts: number;
  next_attempt_at: Date;
  last_error: string | null;
  created_at: Date;
  sent_at: Date | null;
  /** The person the mail is for (null: mail not addressed to a person of Beadline). */
  user_id: number | null;
  /** The sender's claim while it is "sending" (a random id per claim) and when it was taken. */
  claimed_by: string | null;
  claimed_at: Date | null;
};

export type ExportRow = {
  id: number;
  user_id: number;
  format: "xlsx" | "csv";
  /** JSON. */
  filter: string;
  status: "running" | "done" | "failed";
  row_count: number | null;
  started_at: Date;
  finished_at: Date | null;
};

export type JointOverrideRow = {
  id: number;
  job_id: number;
  subject_type: "heater" | "coil";
  subject_id: number;
  reason: string;
  granted_by: number;
  granted_at: Date;
  expires_at: Date;
};

export type JointOverrideUseRow = { joint_id: number; override_id: number; block_kind: string; message: string };

/** An alert for one person, waiting to be folded into a mail (outbox_id null) or in one. */
export type NotificationRow = {
  id: number;
  user_id: number;
  kind: string;
  subject: string;
  body_text: string;
  /** The in-app page it points to ("/joints/35"), or null. */
  link_path: string | null;
  dedupe_key: string | null;
  created_at: Date;
  outbox_id: number | null;
};

export type JointTraceRow = {
  id: number;
  joint_id: number;
  attachment_id: number;
  revision_no: number;
  sample_count: number;
  pressure_unit: "mpa" | "psi";
  /** JSON PressureTraceReading. */
  reading: string;
  /** JSON ChartPoint[]. */
  chart: string;
  outcome: "within-limits" | "out-of-limits";
  /** JSON JointFinding[]. */
  findings: string;
  finding_parameters: string | null;
  uploaded_by: number;
  uploaded_at: Date;
};

export type JointFindingRow = { joint_id: number; parameter: string; made_at: Date };

/** organisation_settings: one row (id 1); time_zone NULL until an admin chooses one. */
export type OrganisationSettingsRow = { id: number; time_zone: string | null; updated_by: number | null; updated_at: Date };
