// Handling after fusion: no pulling, installation or rough handling for another 30 minutes
// after the joint is taken out of the machine (PPI generic butt-fusion procedure, as
// reproduced in a pipe maker's PE pipe manual; 49 CFR 192.281(a): not disturbed until
// properly set). One definition for the procedure's note and the plan panel's row.
import type { Sourced } from '@/domain/sources';

export const HANDLING_WAIT_MINUTES = 30;

export const HANDLING_WAIT_SOURCE: Sourced = { source: "PPI generic butt-fusion procedure, as reproduced in a pipe maker's manual", status: 'confirmed-2nd' };

/** The note ASTM F2620 procedures carry (stored plans keep this exact text). */
export const HANDLING_WAIT_NOTE = `After cooling in the machine, avoid pulling, installation or rough handling for another ${HANDLING_WAIT_MINUTES} minutes (confirmed in a reproduction).`;
