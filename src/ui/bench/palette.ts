// Colours and words of the stress strip (ours). A and B keep the design colours used everywhere;
// the event kinds get a palette of their own, distinct from both and readable on light and dark.
import type { EventKind, StressEvent } from '../../engine/render/index.ts';
import { num } from '../format.ts';

export const KIND_COLOUR: Record<EventKind, { light: string; dark: string }> = {
  excursion: { light: '#6741d9', dark: '#9775fa' },
  xlim: { light: '#c92a2a', dark: '#ff6b6b' },
  'radiator-excursion': { light: '#9c36b5', dark: '#da77f2' },
  'coil-temperature': { light: '#d9480f', dark: '#ff8c42' },
  'port-speed': { light: '#1971c2', dark: '#4dabf7' },
  'amplifier-clip': { light: '#343a40', dark: '#ced4da' },
  compression: { light: '#2b8a3e', dark: '#69db7c' },
  distortion: { light: '#d6336c', dark: '#f783ac' },
};

export const KIND_LABEL: Record<EventKind, string> = {
  excursion: 'Cone past Xmax',
  xlim: 'Cone at its mechanical limit',
  'radiator-excursion': 'Radiator past its Xmax',
  'coil-temperature': 'Coil above its rating',
  'port-speed': 'Port air too fast',
  'amplifier-clip': 'Amplifier clipping',
  compression: 'Compression: the hot coil over 1 dB, or the output over 3 dB',
  distortion: 'Distortion within 20 dB (10 %) of the music',
};

/** Plain words on what an event means for the listener. */
export const KIND_MEANING: Record<EventKind, string> = {
  excursion: 'the cone travels beyond its linear range: bass turns muddy and distorted',
  xlim: 'the cone reaches its end stop: damage risk, a knock or a rattle',
  'radiator-excursion': 'the passive radiator travels beyond its linear range',
  'coil-temperature': 'the voice coil runs hotter than its rating: long-term damage risk',
  'port-speed': 'air in the port moves fast enough to be heard as chuffing',
  'amplifier-clip': 'the amplifier runs out of voltage: harsh, flattened peaks',
  compression: 'the speaker plays quieter than asked: a hot coil, or the port and suspension holding back the bass',
  distortion: 'the added distortion is loud enough, relative to the music, to be heard',
};

export const colourOf = (kind: EventKind, theme: string) => KIND_COLOUR[kind][theme === 'dark' ? 'dark' : 'light'];

export function clock(seconds: number, decimals = 1): string {
  if (!Number.isFinite(seconds) || seconds < 0) seconds = 0;
  // Round first, so 59.96 s reads 1:00.0 rather than 0:60.0.
  const scale = 10 ** decimals;
  const rounded = Math.round(seconds * scale) / scale;
  const m = Math.floor(rounded / 60);
  const s = rounded - m * 60;
  return `${m}:${s.toFixed(decimals).padStart(decimals ? 3 + decimals : 2, '0')}`;
}

export function describeEvent(e: StressEvent): string {
  const dur = e.end_s - e.start_s;
  return `${KIND_LABEL[e.kind]} at ${clock(e.start_s, 2)} for ${dur < 1 ? `${Math.max(1, Math.round(dur * 1000))} ms` : `${num(dur, 3)} s`}: peak ${num(e.peak, 3)} ${e.unit}, limit ${num(e.limit, 3)} ${e.unit}`;
}
