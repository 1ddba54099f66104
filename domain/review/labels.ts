// Plain words for what the review screen shows: parameter names, joint states, decisions.
import type { JointParameter } from "@/domain/fusion/check";

export const PARAMETER_LABELS: Record<JointParameter, string> = {
  heaterTemperature: "Heater temperature",
  beadUpPressure: "Bead-up pressure",
  fusionPressure: "Fusion pressure",
  bead: "Bead size",
  heatSoak: "Heat soak",
  heatSoakPressure: "Heat-soak pressure",
  changeover: "Changeover",
  pressureBuildUp: "Pressure build-up",
  cooling: "Cooling",
  coolingPressure: "Cooling pressure",
  facing: "Facing",
  alignment: "Alignment",
  visualBead: "Visual bead check",
};

export type ReviewState = "pending-review" | "accepted" | "cut-out";

export const REVIEW_STATE_LABELS: Record<ReviewState, string> = {
  "pending-review": "Pending review",
  accepted: "Accepted",
  "cut-out": "Cut out",
};

export const OUTCOME_LABELS = { "within-limits": "Within limits", "out-of-limits": "Out of limits" } as const;

export const REVISION_KIND_LABELS: Record<string, string> = {
  recorded: "Recorded",
  corrected: "Corrected",
  accepted: "Accepted",
  "cut-out": "Cut out",
  "trace-attached": "Pressure trace attached",
};
