// Outside misalignment (hi-lo) of the two pipe ends in the machine: at most 10 % of the
// wall. Pipe makers' butt-fusion guides state it for every procedure here, so it is one
// rule for all of them; the joint check applies it to a recorded misalignment.
import type { Sourced } from '@/domain/sources';

/** Outside misalignment allowed, as a fraction of the wall. */
export const MAX_MISALIGNMENT_WALL_FRACTION = 0.1;

export const MISALIGNMENT_SOURCE: Sourced = {
  source: "PE pipe makers' butt-fusion guides: outside misalignment (hi-lo) at most 10 % of the wall",
  status: 'confirmed-2nd',
};
