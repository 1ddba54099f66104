// The bounds of a pressure plan's input, one home for the plan form's schema and the
// fusion-plan query (kept free of imports so the Trench's schema chunk stays small).

/** The pipe and machine values a plan is worked out for (canonical SI); a request outside them is refused, naming the field, before any calculation. */
export const PLAN_INPUT_BOUNDS = {
  outsideDiameterMm: { above: 0, max: 2000 },
  sdr: { above: 2, max: 100 },
  dragPressureMpa: { min: 0, max: 50 },
} as const;
