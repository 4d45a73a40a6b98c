// The small typed message protocol between the page and the listening-bench worklet.
// Every message is plain data (structured-clone safe); `parseToWorklet` / `parseFromWorklet` check
// one that arrives and name the field, the value and what was allowed when it is wrong.
import type { SpeakerSystem } from '../engine/system.ts';
import type { RenderMode, StressEvent } from '../engine/render/index.ts';
import { EVENT_KINDS } from '../engine/render/index.ts';
import { LANE_IDS, type LaneId } from './lanes.ts';
import { FILTER_SHAPES, LADDER_PARTS, MAX_DRIVERS_PER_WAY, MAX_WAYS } from '../engine/design/schema.ts';
import { BOX_TYPES } from '../engine/box/index.ts';
import { MAX_TAPS } from '../engine/fir/correction.ts';
import type { WayTaps } from './measured-taps.ts';

export type { LaneId };
export type DesignSlot = 'a' | 'b';
export const DESIGN_SLOTS: readonly DesignSlot[] = ['a', 'b'];

/** What the user hears of a design: the engine's stream names, with labels of our own. */
export type ListenMode = RenderMode;
export const LISTEN_MODES: readonly ListenMode[] = ['nonlinear', 'linear', 'residual'];
export const LISTEN_MODE_LABEL: Record<ListenMode, string> = {
  nonlinear: 'as modelled',
  linear: 'linear only',
  residual: 'distortion only',
};

/** The name the processor registers under. */
export const BENCH_PROCESSOR = 'preheard-bench';

/** Longest track the bench accepts, frames per channel (an hour at 96 kHz). */
export const MAX_TRACK_FRAMES = 3600 * 96000;

export interface LoopRegion {
  startFrame: number;
  endFrame: number;
}

export type ToWorklet =
  | { type: 'track'; channels: Float32Array[] }
  /** `measuredTaps`: the measured ways' FIRs, built on the page (the worklet must not build them). */
  | { type: 'design'; slot: DesignSlot; system: SpeakerSystem; voltsFs: number; measuredTaps?: WayTaps[] }
  | { type: 'level'; slot: DesignSlot; voltsFs: number }
  | { type: 'lane'; lane: LaneId }
  | { type: 'mode'; mode: ListenMode }
  | { type: 'monitor'; gainDb: number }
  | { type: 'match'; on: boolean }
  | { type: 'loop'; region: LoopRegion | null }
  | { type: 'seek'; frame: number }
  | { type: 'play'; playing: boolean };

/** The meters of one design at the moment of a report. */
export interface MeterSample {
  excursionMm: number;
  coilTempC: number;
  portSpeed: number;
  compressionDb: number;
  residualDb: number;
}

export interface SwitchReport {
  type: 'switched';
  from: LaneId;
  lane: LaneId;
  /** Frames the mixer had produced when the crossfade began: a multiple of `quantum` when on a block boundary. */
  blockFrame: number;
  quantum: number;
  fadeFrames: number;
  /** Largest sample-to-sample step of the output over the crossfade (and the block edge before it). */
  maxStep: number;
  /** The step a linear crossfade of these two lanes can make at most over the same frames. */
  allowedStep: number;
  /** max over the fade of step / its own per-sample bound: at most 1 when the switch is clean. */
  worstRatio: number;
}

export type FromWorklet =
  | { type: 'ready'; sampleRate: number; latencyFrames: number }
  | {
      type: 'position';
      /** Track frame being heard (input position less the render latency). */
      frame: number;
      playing: boolean;
      lane: LaneId;
      /** Time spent in process() over the quanta's real time, last half second. */
      load: number;
      /** Quanta whose process() took longer than their real time. */
      lateBlocks: number;
      meters: Record<DesignSlot, MeterSample | null>;
    }
  | SwitchReport
  | { type: 'events'; slot: DesignSlot; from: number; events: StressEvent[] }
  | { type: 'levels'; paPerFs: number; gains: Record<LaneId, number>; passbandPa: Record<DesignSlot, number> }
  | { type: 'ended' }
  | { type: 'error'; message: string };

export type Parsed<T> = { ok: true; msg: T } | { ok: false; error: string };

class Bad extends Error {}

const show = (v: unknown): string => {
  if (typeof v === 'string') return JSON.stringify(v.length > 40 ? v.slice(0, 40) + '…' : v);
  if (typeof v === 'number' || typeof v === 'boolean' || v === null || v === undefined) return String(v);
  if (Array.isArray(v)) return `an array of ${v.length}`;
  return typeof v === 'object' ? `an object (${(v as object).constructor?.name ?? 'plain'})` : typeof v;
};

function obj(v: unknown, field: string): Record<string, unknown> {
  if (v === null || typeof v !== 'object' || Array.isArray(v)) throw new Bad(`${field} must be an object, got ${show(v)}`);
  return v as Record<string, unknown>;
}

function num(o: Record<string, unknown>, key: string, min: number, max: number, path: string, integer = false): number {
  const v = o[key];
  if (typeof v !== 'number' || !Number.isFinite(v)) throw new Bad(`${path}.${key} must be a finite number, got ${show(v)}`);
  if (integer && !Number.isInteger(v)) throw new Bad(`${path}.${key} must be a whole number, got ${v}`);
  if (v < min || v > max) throw new Bad(`${path}.${key} must be within ${min}..${max}, got ${v}`);
  return v;
}

function oneOf<T extends string>(o: Record<string, unknown>, key: string, allowed: readonly T[], path: string): T {
  const v = o[key];
  if (typeof v !== 'string' || !(allowed as readonly string[]).includes(v))
    throw new Bad(`${path}.${key} must be one of ${allowed.join(', ')}, got ${show(v)}`);
  return v as T;
}

function str(o: Record<string, unknown>, key: string, path: string): string {
  const v = o[key];
  if (typeof v !== 'string') throw new Bad(`${path}.${key} must be a string, got ${show(v)}`);
  return v;
}

function bool(o: Record<string, unknown>, key: string, path: string): boolean {
  const v = o[key];
  if (typeof v !== 'boolean') throw new Bad(`${path}.${key} must be true or false, got ${show(v)}`);
  return v;
}

/** A validated SpeakerSystem has these parts; the renderer checks the numbers themselves. */
function system(v: unknown, path: string): SpeakerSystem {
  const s = obj(v, path);
  if (typeof s.name !== 'string') throw new Bad(`${path}.name must be a string, got ${show(s.name)}`);
  for (const part of ['air', 'amplifier', 'listening']) obj(s[part], `${path}.${part}`);
  const ways = s.ways;
  if (!Array.isArray(ways) || ways.length < 1 || ways.length > MAX_WAYS)
    throw new Bad(`${path}.ways must be a list of 1 to ${MAX_WAYS} ways, got ${show(ways)}`);
  for (const [k, w] of ways.entries()) way(w, `${path}.ways[${k}]`);
  if (!ways.some((w) => (w as Record<string, unknown>).kind === 'driver')) throw new Bad(`${path}.ways has no way with a driver`);
  return v as SpeakerSystem;
}

function way(v: unknown, path: string): void {
  const w = obj(v, path);
  if (typeof w.name !== 'string') throw new Bad(`${path}.name must be a string, got ${show(w.name)}`);
  const kind = oneOf(w, 'kind', ['driver', 'flat'], path);
  const f = obj(w.filter, `${path}.filter`);
  oneOf(f, 'type', ['active'], `${path}.filter`);
  for (const band of ['highpass', 'lowpass']) {
    if (f[band] === null) continue;
    const b = obj(f[band], `${path}.filter.${band}`);
    oneOf(b, 'shape', FILTER_SHAPES, `${path}.filter.${band}`);
    num(b, 'hz', Number.MIN_VALUE, Number.MAX_VALUE, `${path}.filter.${band}`);
  }
  num(f, 'gain', 0, Number.MAX_VALUE, `${path}.filter`);
  num(f, 'delay', 0, Number.MAX_VALUE, `${path}.filter`);
  if (w.polarity !== 1 && w.polarity !== -1) throw new Bad(`${path}.polarity must be 1 or -1, got ${show(w.polarity)}`);
  num(w, 'offset', -Number.MAX_VALUE, Number.MAX_VALUE, path);
  if (kind === 'flat') {
    num(w, 'paPerV', 0, Number.MAX_VALUE, path);
    return;
  }
  for (const part of ['driver', 'unit']) {
    const d = obj(w[part], `${path}.${part}`);
    for (const k of ['fs', 're', 'bl', 'mms', 'cms', 'sd', 'xmax']) num(d, k, Number.MIN_VALUE, Number.MAX_VALUE, `${path}.${part}`);
  }
  num(w, 'count', 1, MAX_DRIVERS_PER_WAY, path, true);
  oneOf(w, 'wiring', ['series', 'parallel'], path);
  if (w.network !== undefined) {
    if (!Array.isArray(w.network)) throw new Bad(`${path}.network must be a list of parts, got ${show(w.network)}`);
    for (const [k, p] of w.network.entries()) {
      const q = obj(p, `${path}.network[${k}]`);
      oneOf(q, 'at', ['series', 'shunt'], `${path}.network[${k}]`);
      oneOf(q, 'part', LADDER_PARTS, `${path}.network[${k}]`);
      for (const x of ['r', 'l', 'c', 'dcr', 'ratedW']) num(q, x, 0, Number.MAX_VALUE, `${path}.network[${k}]`);
    }
  }
  oneOf(obj(w.box, `${path}.box`), 'type', BOX_TYPES, `${path}.box`);
}

function wayTaps(v: unknown, path: string): WayTaps[] {
  if (!Array.isArray(v) || v.length > MAX_WAYS) throw new Bad(`${path} must be a list of at most ${MAX_WAYS} FIRs, got ${show(v)}`);
  return v.map((item, i) => {
    const o = obj(item, `${path}[${i}]`);
    const way = num(o, 'way', 0, MAX_WAYS - 1, `${path}[${i}]`, true);
    const sampleRate = num(o, 'sampleRate', 1, 1e6, `${path}[${i}]`);
    const taps = o.taps;
    if (!(taps instanceof Float64Array) || taps.length < 1 || taps.length > MAX_TAPS)
      throw new Bad(`${path}[${i}].taps must be a Float64Array of 1 to ${MAX_TAPS} taps, got ${show(taps)}`);
    for (let k = 0; k < taps.length; k++)
      if (!Number.isFinite(taps[k])) throw new Bad(`${path}[${i}].taps[${k}] must be a finite number, got ${taps[k]}`);
    return { way, sampleRate, taps };
  });
}

function channels(v: unknown, path: string): Float32Array[] {
  if (!Array.isArray(v) || v.length < 1 || v.length > 2) throw new Bad(`${path} must be an array of 1 or 2 channels, got ${show(v)}`);
  let n = -1;
  v.forEach((c, i) => {
    if (!(c instanceof Float32Array)) throw new Bad(`${path}[${i}] must be a Float32Array, got ${show(c)}`);
    if (n >= 0 && c.length !== n)
      throw new Bad(`${path}[${i}] has ${c.length} frames, channel 0 has ${n}: channels must be the same length`);
    n = c.length;
  });
  if (n < 1) throw new Bad(`${path} is empty: a track needs at least one frame`);
  if (n > MAX_TRACK_FRAMES) throw new Bad(`${path} has ${n} frames, at most ${MAX_TRACK_FRAMES} allowed`);
  return v as Float32Array[];
}

function guarded<T>(fn: () => T): Parsed<T> {
  try {
    return { ok: true, msg: fn() };
  } catch (e) {
    if (e instanceof Bad) return { ok: false, error: e.message };
    throw e;
  }
}

/** Checks a message for the worklet. */
export function parseToWorklet(data: unknown): Parsed<ToWorklet> {
  return guarded(() => {
    const m = obj(data, 'message');
    const p = `message(${show(m.type)})`;
    switch (m.type) {
      case 'track':
        return { type: 'track', channels: channels(m.channels, `${p}.channels`) };
      case 'design':
        return {
          type: 'design',
          slot: oneOf(m, 'slot', DESIGN_SLOTS, p),
          system: system(m.system, `${p}.system`),
          voltsFs: num(m, 'voltsFs', 1e-6, 1e4, p),
          ...(m.measuredTaps === undefined ? {} : { measuredTaps: wayTaps(m.measuredTaps, `${p}.measuredTaps`) }),
        };
      case 'level':
        return { type: 'level', slot: oneOf(m, 'slot', DESIGN_SLOTS, p), voltsFs: num(m, 'voltsFs', 1e-6, 1e4, p) };
      case 'lane':
        return { type: 'lane', lane: oneOf(m, 'lane', LANE_IDS, p) };
      case 'mode':
        return { type: 'mode', mode: oneOf(m, 'mode', LISTEN_MODES, p) };
      case 'monitor':
        return { type: 'monitor', gainDb: num(m, 'gainDb', -120, 12, p) };
      case 'match':
        return { type: 'match', on: bool(m, 'on', p) };
      case 'loop': {
        if (m.region === null) return { type: 'loop', region: null };
        const r = obj(m.region, `${p}.region`);
        const startFrame = num(r, 'startFrame', 0, MAX_TRACK_FRAMES, `${p}.region`, true);
        const endFrame = num(r, 'endFrame', 0, MAX_TRACK_FRAMES, `${p}.region`, true);
        if (endFrame <= startFrame) throw new Bad(`${p}.region.endFrame (${endFrame}) must be after startFrame (${startFrame})`);
        return { type: 'loop', region: { startFrame, endFrame } };
      }
      case 'seek':
        return { type: 'seek', frame: num(m, 'frame', 0, MAX_TRACK_FRAMES, p, true) };
      case 'play':
        return { type: 'play', playing: bool(m, 'playing', p) };
      default:
        throw new Bad(
          `unknown message type ${show(m.type)}: expected one of track, design, level, lane, mode, monitor, match, loop, seek, play`,
        );
    }
  });
}

function meter(v: unknown, path: string): MeterSample | null {
  if (v === null) return null;
  const o = obj(v, path);
  const big = 1e9;
  return {
    excursionMm: num(o, 'excursionMm', 0, big, path),
    coilTempC: num(o, 'coilTempC', -100, big, path),
    portSpeed: num(o, 'portSpeed', 0, big, path),
    compressionDb: num(o, 'compressionDb', -big, big, path),
    residualDb: num(o, 'residualDb', -big, big, path),
  };
}

function stressEvents(v: unknown, path: string): StressEvent[] {
  if (!Array.isArray(v)) throw new Bad(`${path} must be an array, got ${show(v)}`);
  return v.map((e, i) => {
    const o = obj(e, `${path}[${i}]`);
    const q = `${path}[${i}]`;
    const big = 1e12;
    const event = {
      kind: oneOf(o, 'kind', EVENT_KINDS, q),
      // The way whose limit was crossed (null: the summed output; absent from a first-version render).
      way: o.way === undefined || o.way === null ? null : str(o, 'way', q),
      start_s: num(o, 'start_s', 0, big, q),
      end_s: num(o, 'end_s', 0, big, q),
      peak: num(o, 'peak', -big, big, q),
      unit: str(o, 'unit', q),
      limit: num(o, 'limit', -big, big, q),
    };
    return event as StressEvent;
  });
}

function laneRecord(v: unknown, path: string): Record<LaneId, number> {
  const o = obj(v, path);
  return { a: num(o, 'a', 0, 1e6, path), b: num(o, 'b', 0, 1e6, path), ref: num(o, 'ref', 0, 1e6, path) };
}

/** Checks a report from the worklet. */
export function parseFromWorklet(data: unknown): Parsed<FromWorklet> {
  return guarded((): FromWorklet => {
    const m = obj(data, 'report');
    const p = `report(${show(m.type)})`;
    const big = 1e12;
    switch (m.type) {
      case 'ready':
        return {
          type: 'ready',
          sampleRate: num(m, 'sampleRate', 8000, 384000, p),
          latencyFrames: num(m, 'latencyFrames', 0, 1e6, p, true),
        };
      case 'position': {
        const meters = obj(m.meters, `${p}.meters`);
        return {
          type: 'position',
          frame: num(m, 'frame', 0, MAX_TRACK_FRAMES, p, true),
          playing: bool(m, 'playing', p),
          lane: oneOf(m, 'lane', LANE_IDS, p),
          load: num(m, 'load', 0, 1e3, p),
          lateBlocks: num(m, 'lateBlocks', 0, big, p, true),
          meters: { a: meter(meters.a, `${p}.meters.a`), b: meter(meters.b, `${p}.meters.b`) },
        };
      }
      case 'switched':
        return {
          type: 'switched',
          from: oneOf(m, 'from', LANE_IDS, p),
          lane: oneOf(m, 'lane', LANE_IDS, p),
          blockFrame: num(m, 'blockFrame', 0, big, p, true),
          quantum: num(m, 'quantum', 1, 1e5, p, true),
          fadeFrames: num(m, 'fadeFrames', 1, 1e6, p, true),
          maxStep: num(m, 'maxStep', 0, big, p),
          allowedStep: num(m, 'allowedStep', 0, big, p),
          worstRatio: num(m, 'worstRatio', 0, big, p),
        };
      case 'events':
        return {
          type: 'events',
          slot: oneOf(m, 'slot', DESIGN_SLOTS, p),
          from: num(m, 'from', 0, big, p, true),
          events: stressEvents(m.events, `${p}.events`),
        };
      case 'levels': {
        const pb = obj(m.passbandPa, `${p}.passbandPa`);
        return {
          type: 'levels',
          paPerFs: num(m, 'paPerFs', 0, big, p),
          gains: laneRecord(m.gains, `${p}.gains`),
          passbandPa: { a: num(pb, 'a', 0, big, `${p}.passbandPa`), b: num(pb, 'b', 0, big, `${p}.passbandPa`) },
        };
      }
      case 'ended':
        return { type: 'ended' };
      case 'error':
        if (typeof m.message !== 'string') throw new Bad(`${p}.message must be a string, got ${show(m.message)}`);
        return { type: 'error', message: m.message };
      default:
        throw new Bad(`unknown report type ${show(m.type)}: expected one of ready, position, switched, events, levels, ended, error`);
    }
  });
}

/** A message and the buffers to move with it (the track's samples move rather than copy). */
export function encodeToWorklet(msg: ToWorklet): { message: ToWorklet; transfer: Transferable[] } {
  const checked = parseToWorklet(msg);
  if (!checked.ok) throw new RangeError(checked.error);
  const transfer: Transferable[] = msg.type === 'track' ? [...new Set(msg.channels.map((c) => c.buffer as ArrayBuffer))] : [];
  return { message: msg, transfer };
}
