// Signals of the phase control that reach a fuser who is not looking at the phone: a
// vibration where the device has one (navigator.vibrate; not on every browser) and a
// short beep through Web Audio. Browsers only let sound start after a tap, so the first
// tap on the phase button opens the audio (prepareCues); a signal that cannot play is
// skipped silently, the screen still says it in words.

export type Cue = "phase" | "limit" | "done";

const VIBRATION: Record<Cue, number[]> = {
  phase: [200],
  limit: [300, 120, 300, 120, 300],
  done: [150, 100, 150],
};

/** Beeps of each cue: pitch (Hz) and length (ms); a limit is three high beeps. */
const BEEPS: Record<Cue, { hz: number; ms: number }[]> = {
  phase: [{ hz: 880, ms: 160 }],
  limit: [
    { hz: 1320, ms: 180 },
    { hz: 1320, ms: 180 },
    { hz: 1320, ms: 180 },
  ],
  done: [
    { hz: 660, ms: 140 },
    { hz: 990, ms: 200 },
  ],
};

let audio: AudioContext | null = null;

function audioContext(): AudioContext | null {
  if (typeof window === "undefined") return null;
  const Ctor = window.AudioContext ?? (window as unknown as { webkitAudioContext?: typeof AudioContext }).webkitAudioContext;
  if (!Ctor) return null;
  try {
    audio ??= new Ctor();
    if (audio.state === "suspended") void audio.resume().catch(() => undefined);
    return audio;
  } catch {
    return null;
  }
}

/** Call from a tap: lets later signals (a limit reached while the phone lies on the machine) be heard. */
export function prepareCues(): void {
  audioContext();
}

function beep(ctx: AudioContext, steps: { hz: number; ms: number }[]): void {
  let at = ctx.currentTime + 0.01;
  for (const { hz, ms } of steps) {
    const osc = ctx.createOscillator();
    const gain = ctx.createGain();
    osc.type = "square";
    osc.frequency.value = hz;
    gain.gain.setValueAtTime(0.0001, at);
    gain.gain.exponentialRampToValueAtTime(0.25, at + 0.01);
    gain.gain.exponentialRampToValueAtTime(0.0001, at + ms / 1000);
    osc.connect(gain).connect(ctx.destination);
    osc.start(at);
    osc.stop(at + ms / 1000 + 0.02);
    at += ms / 1000 + 0.08;
  }
}

/** Vibrate and beep for a phase change, a limit reached, or the last phase ended. */
export function signal(cue: Cue): void {
  try {
    if (typeof navigator !== "undefined" && typeof navigator.vibrate === "function") navigator.vibrate(VIBRATION[cue]);
  } catch {
    // A browser may refuse vibration (no user gesture yet, or a setting): the words remain.
  }
  const ctx = audioContext();
  if (ctx) {
    try {
      beep(ctx, BEEPS[cue]);
    } catch {
      // No audio output: the words remain.
    }
  }
}
