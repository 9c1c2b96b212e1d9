/**
 * Short tones for the station screen, made with the Web Audio API (no audio files): a rising
 * two-tone for "accepted" and a low buzz for "refused", so a gloved assembler looking at the
 * part, not the screen, still knows what happened.
 */

export type FeedbackKind = 'accept' | 'refuse';

export interface Tone {
  /** Hz */
  frequency: number;
  /** Seconds after the sound starts. */
  startAt: number;
  /** Seconds. */
  duration: number;
  type: OscillatorType;
  /** Peak gain 0..1. */
  gain: number;
}

/** The tones for each kind of feedback. */
export function feedbackTones(kind: FeedbackKind): Tone[] {
  if (kind === 'accept') {
    // Rising fifth: A5 then E6, short and bright.
    return [
      { frequency: 880, startAt: 0, duration: 0.11, type: 'sine', gain: 0.35 },
      { frequency: 1318.5, startAt: 0.12, duration: 0.16, type: 'sine', gain: 0.35 },
    ];
  }
  // A low, rough buzz, long enough to notice over a line's noise.
  return [{ frequency: 130, startAt: 0, duration: 0.5, type: 'square', gain: 0.25 }];
}

type AudioContextCtor = new () => AudioContext;

function audioContextClass(): AudioContextCtor | null {
  if (typeof window === 'undefined') return null;
  const w = window as unknown as { AudioContext?: AudioContextCtor; webkitAudioContext?: AudioContextCtor };
  return w.AudioContext ?? w.webkitAudioContext ?? null;
}

let shared: AudioContext | null = null;

/** Plays the feedback sound; silent (never throwing) where the browser has no Web Audio. */
export function useFeedbackSound() {
  function context(): AudioContext | null {
    if (shared) return shared;
    const Ctor = audioContextClass();
    if (!Ctor) return null;
    shared = new Ctor();
    return shared;
  }

  function play(kind: FeedbackKind): void {
    const ctx = context();
    if (!ctx) return;
    // Browsers start audio suspended until a key press or touch; scans and taps are both.
    if (ctx.state === 'suspended') {
      ctx.resume().catch((err: unknown) => console.warn('[sound] audio could not start:', err));
    }
    const t0 = ctx.currentTime + 0.01;
    for (const tone of feedbackTones(kind)) {
      const osc = ctx.createOscillator();
      const gain = ctx.createGain();
      osc.type = tone.type;
      osc.frequency.setValueAtTime(tone.frequency, t0 + tone.startAt);
      // Short attack and release so the tones do not click.
      gain.gain.setValueAtTime(0.0001, t0 + tone.startAt);
      gain.gain.exponentialRampToValueAtTime(tone.gain, t0 + tone.startAt + 0.01);
      gain.gain.setValueAtTime(tone.gain, t0 + tone.startAt + tone.duration - 0.03);
      gain.gain.exponentialRampToValueAtTime(0.0001, t0 + tone.startAt + tone.duration);
      osc.connect(gain).connect(ctx.destination);
      osc.start(t0 + tone.startAt);
      osc.stop(t0 + tone.startAt + tone.duration + 0.02);
    }
  }

  return { play };
}
