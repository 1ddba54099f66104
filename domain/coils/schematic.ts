// Trace schematic: where a lot's joints lie along a job's run, as distances from the start
// of the run, for a simple drawing without map tiles. Distance comes from the station text
// when it parses (US survey stations of 100 ft: "12+50" = 1,250 ft; metric chainage of
// km + m: "1+250.5" = 1,250.5 m — common practice, no published source), else from the
// latitude/longitude projected on the line between the two joints farthest apart
// (equirectangular approximation, fine over a job's few km), else from the joint number.

export type StationDistance = { metres: number; system: 'us-100ft' | 'metric-km' };

const M_PER_FT = 0.3048; // exact, NIST SP 811

/**
 * Distance of a station text from station 0, m. "12+50", "STA 12+50.5", "12 + 50" →
 * 1,250 ft = 381 m (two digits after "+": 100-ft stations); "0+125", "1+250.5" → 125 m,
 * 1,250.5 m (three digits after "+": kilometre chainage). A plain number is taken as m.
 * null when the text has no station.
 */
export function parseStation(text: string | null | undefined): StationDistance | null {
  if (!text) return null;
  const match = /(\d+)\s*\+\s*(\d+)(\.\d+)?/.exec(text);
  if (match) {
    const major = Number(match[1]);
    const minorDigits = match[2] as string;
    const minor = Number(minorDigits + (match[3] ?? ''));
    if (minorDigits.length === 2) return { metres: (major * 100 + minor) * M_PER_FT, system: 'us-100ft' };
    if (minorDigits.length === 3) return { metres: major * 1000 + minor, system: 'metric-km' };
    return null;
  }
  const plain = /^\s*(\d+(?:\.\d+)?)\s*m?\s*$/.exec(text);
  return plain ? { metres: Number(plain[1]), system: 'metric-km' } : null;
}

const EARTH_RADIUS_M = 6_371_000; // mean radius (IUGG)

export interface SchematicJoint {
  id: number;
  jointNo: number;
  station: string | null;
  latitude: number | null;
  longitude: number | null;
}

export interface SchematicPoint {
  id: number;
  jointNo: number;
  /** Distance along the run from the first point, m (null when placed by joint number). */
  alongM: number | null;
  /** 0–1 position on the drawing. */
  t: number;
  basis: 'station' | 'coordinates' | 'joint-number';
}

/**
 * Positions of a job's joints along its run. Uses stations when every joint has one that
 * parses; else coordinates when every joint has them; else joint numbers (evenly spaced).
 * Mixed data falls back to the next basis for all, so one drawing uses one scale.
 */
export function layoutRun(joints: readonly SchematicJoint[]): { basis: SchematicPoint['basis']; lengthM: number | null; points: SchematicPoint[] } {
  if (joints.length === 0) return { basis: 'joint-number', lengthM: null, points: [] };
  const stations = joints.map((j) => parseStation(j.station));
  if (stations.every((s) => s !== null)) {
    const metres = stations.map((s) => (s as StationDistance).metres);
    return scaled(joints, metres, 'station');
  }
  if (joints.every((j) => j.latitude != null && j.longitude != null)) {
    const lat0 = (joints.reduce((sum, j) => sum + (j.latitude as number), 0) / joints.length) * (Math.PI / 180);
    const xy = joints.map((j) => [
      (j.longitude as number) * (Math.PI / 180) * Math.cos(lat0) * EARTH_RADIUS_M,
      (j.latitude as number) * (Math.PI / 180) * EARTH_RADIUS_M,
    ]) as [number, number][];
    // The two points farthest apart define the run's line.
    let best: [number, number] = [0, 0];
    let bestD = -1;
    for (let a = 0; a < xy.length; a += 1) {
      for (let b = a + 1; b < xy.length; b += 1) {
        const d = Math.hypot(xy[a]![0] - xy[b]![0], xy[a]![1] - xy[b]![1]);
        if (d > bestD) {
          bestD = d;
          best = [a, b];
        }
      }
    }
    const [ax, ay] = xy[best[0]]!;
    const [bx, by] = xy[best[1]]!;
    const len = Math.hypot(bx - ax, by - ay);
    const along = xy.map(([x, y]) => (len > 0 ? ((x - ax) * (bx - ax) + (y - ay) * (by - ay)) / len : 0));
    return scaled(joints, along, 'coordinates');
  }
  const numbers = joints.map((j) => j.jointNo);
  const min = Math.min(...numbers);
  const max = Math.max(...numbers);
  return {
    basis: 'joint-number',
    lengthM: null,
    points: joints.map((j) => ({ id: j.id, jointNo: j.jointNo, alongM: null, t: max > min ? (j.jointNo - min) / (max - min) : 0.5, basis: 'joint-number' as const })),
  };
}

function scaled(joints: readonly SchematicJoint[], metres: number[], basis: 'station' | 'coordinates') {
  const min = Math.min(...metres);
  const max = Math.max(...metres);
  return {
    basis,
    lengthM: max - min,
    points: joints.map((j, i) => ({
      id: j.id,
      jointNo: j.jointNo,
      alongM: (metres[i] as number) - min,
      t: max > min ? ((metres[i] as number) - min) / (max - min) : 0.5,
      basis,
    })),
  };
}
