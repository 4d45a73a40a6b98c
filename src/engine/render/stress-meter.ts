// Stress of one driver way against its limits (cone travel, the outlet, the amplifier channel's
// rail, coil heat, power compression), and the distortion of the summed output. Per chunk: the
// worst lane per frame and the chunk's maxima; frame by frame only when a limit is crossed.
import type { DriverWay, SpeakerSystem } from '../system.ts';
import type { WooferParams } from '../sim/params.ts';
import { ResidualMeter } from '../level/distortion.ts';
import type { DriverLane } from './way-chain.ts';
import {
  type EventLog,
  EV_CLIP,
  EV_COIL,
  EV_COMPRESSION,
  EV_DISTORTION,
  EV_EXCURSION,
  EV_PORT,
  EV_RADIATOR,
  EV_XLIM,
  OUTPUT_SOURCE,
} from './events.ts';
import { CHUNK } from './way-chain.ts';
import { keepShape } from '../keep-shape.ts';

/** The residual within this many dB of the output counts as audible distortion. */
export const DISTORTION_WITHIN_DB = 20;
/** Sliding window of the distortion measure, s (one-pole energy averages). */
export const DISTORTION_WINDOW_S = 0.05;
/** Output below this seat pressure (Pa rms, 40 dB SPL) is not judged for distortion. */
export const DISTORTION_FLOOR_PA = 0.002;
/** Compression event threshold, dB below the cold-coil output. */
export const COMPRESSION_LIMIT_DB = 1;
/**
 * The output's own compression event (the coherent part of the residual: port, suspension and
 * motor losses at the fundamental), dB below the linear output.
 */
export const OUTPUT_COMPRESSION_LIMIT_DB = 3;
/** |x| at this fraction of Xlim counts as reaching the end stop. */
export const XLIM_FRACTION = 0.98;

/** What a way's box lets out besides the cone, as the stress meter watches it (its box kind's probe). */
export type Outlet = 'port' | 'radiator' | null;

export function outletOf(p: WooferParams): Outlet {
  return p.probe?.kind === 'port-speed' ? 'port' : p.probe?.kind === 'radiator' ? 'radiator' : null;
}

/** Peaks of one driver way so far. */
export interface WayStats {
  name: string;
  outlet: Outlet;
  peakExcursionMm: number;
  peakRadiatorMm: number;
  peakCoilTempC: number;
  peakPortSpeed: number;
  ampClipFrames: number;
  maxCompressionDb: number;
}

export class WayStress {
  stats: WayStats;
  /** Event source index of the way. */
  source = 0;
  private outlet: Outlet = null;
  private xmax = 0;
  private xlimHit = 0;
  /** The box probe's value times this is its quantity (m/s, mm); and its limit in that unit. */
  private toUnit = 0;
  private outletLimit = 0;
  private rail = 0;
  private coilMax = 0;
  private ambient = 0;
  private rCold = 0;
  private r1dB = 0;
  private readonly xAbs = new Float64Array(CHUNK);
  private readonly aux = new Float64Array(CHUNK);
  private readonly dem = new Float64Array(CHUNK);
  /** For the trace recorder: worst excursion (m) and port speed since its last point, and now. */
  traceX = 0;
  tracePort = 0;
  tempC = 0;
  compressionDb = 0;

  constructor(name: string) {
    this.stats = emptyWayStats(name, null);
    keepShape(this);
  }

  configure(sys: SpeakerSystem, way: DriverWay, p: WooferParams, events: EventLog): void {
    const d = way.driver;
    this.source = events.sourceOf(way.name);
    this.outlet = outletOf(p);
    this.stats.name = way.name;
    this.stats.outlet = this.outlet;
    this.xmax = d.xmax;
    this.xlimHit = XLIM_FRACTION * p.xlim;
    this.toUnit = p.probe?.toUnit ?? 0;
    this.outletLimit = p.probe?.limit ?? Infinity;
    this.rail = sys.amplifier.vPeak;
    this.coilMax = d.thermal.coilMaxC;
    this.ambient = sys.air.temperatureC;
    // The model's own cold loop resistance: with a passive network its Thevenin resistance stands
    // where the amplifier's stood (wayParams), so the coil's heat is measured against that.
    this.rCold = p.re0 + p.rs;
    this.r1dB = this.rCold * Math.pow(10, COMPRESSION_LIMIT_DB / 20);
    const s = this.source;
    events.setLimit(s, EV_EXCURSION, d.xmax * 1000);
    events.setLimit(s, EV_XLIM, p.xlim * 1000);
    if (this.outlet === 'radiator') events.setLimit(s, EV_RADIATOR, this.outletLimit);
    events.setLimit(s, EV_COIL, this.coilMax);
    if (this.outlet === 'port') events.setLimit(s, EV_PORT, this.outletLimit);
    events.setLimit(s, EV_CLIP, this.rail);
    events.setLimit(s, EV_COMPRESSION, COMPRESSION_LIMIT_DB);
  }

  /** One chunk of n frames whose first frame is at t0 s (input time), dt s apart. */
  measure(lanes: DriverLane[], n: number, t0: number, dt: number, ev: EventLog): void {
    const st = this.stats,
      src = this.source;
    const vented = this.outlet === 'port',
      radiator = this.outlet === 'radiator';
    const rail = this.rail,
      xmax = this.xmax,
      xlimHit = this.xlimHit,
      toUnit = this.toUnit,
      outletLimit = this.outletLimit;
    let rMax = 0,
      riseMax = 0;
    for (const lane of lanes) {
      if (lane.sim.r > rMax) rMax = lane.sim.r;
      if (lane.sim.riseV > riseMax) riseMax = lane.sim.riseV;
    }
    const tempC = this.ambient + riseMax;
    const compDb = rMax > this.rCold ? 20 * Math.log10(rMax / this.rCold) : 0;
    this.tempC = tempC;
    this.compressionDb = compDb;
    if (tempC > st.peakCoilTempC) st.peakCoilTempC = tempC;
    if (compDb > st.maxCompressionDb) st.maxCompressionDb = compDb;
    // The chunk's maxima over every lane and frame: all that is needed unless a limit is crossed.
    let peakX = 0,
      peakA = 0,
      peakD = 0;
    for (let w = 0; w < lanes.length; w++) {
      const lane = lanes[w];
      const lx = lane.x,
        lp = lane.outlet,
        ld = lane.uDel;
      for (let k = 0; k < n; k++) {
        const xv = Math.abs(lx[k]);
        const av = Math.abs(lp[k]);
        const dv = Math.abs(ld[k]);
        if (xv > peakX) peakX = xv;
        if (av > peakA) peakA = av;
        if (dv > peakD) peakD = dv;
      }
    }
    // Frame by frame only where a per-frame limit is crossed somewhere in the chunk.
    if (peakX > xmax || ((vented || radiator) && peakA * toUnit > outletLimit) || peakD > rail) {
      this.worstLane(lanes, n);
      const xAbs = this.xAbs,
        aux = this.aux,
        dem = this.dem;
      for (let k = 0; k < n; k++) {
        const t = t0 + k * dt;
        const xk = xAbs[k];
        if (xk > xmax) {
          ev.mark(src, EV_EXCURSION, t, xk * 1000);
          if (xk >= xlimHit) ev.mark(src, EV_XLIM, t, xk * 1000);
        }
        const ak = aux[k];
        if (vented) {
          if (ak * toUnit > outletLimit) ev.mark(src, EV_PORT, t, ak * toUnit);
        } else if (radiator && ak * toUnit > outletLimit) ev.mark(src, EV_RADIATOR, t, ak * toUnit);
        if (dem[k] > rail) {
          st.ampClipFrames++;
          ev.mark(src, EV_CLIP, t, dem[k]);
        }
      }
    }
    // The coil's heat and its compression hold for the whole chunk: every frame of it, one value.
    if (n > 0) {
      const tLast = t0 + (n - 1) * dt;
      if (tempC > this.coilMax) ev.markSpan(src, EV_COIL, t0, tLast, tempC);
      if (rMax > this.r1dB) ev.markSpan(src, EV_COMPRESSION, t0, tLast, compDb);
    }
    if (peakX * 1000 > st.peakExcursionMm) st.peakExcursionMm = peakX * 1000;
    if (vented && peakA * toUnit > st.peakPortSpeed) st.peakPortSpeed = peakA * toUnit;
    if (radiator && peakA * toUnit > st.peakRadiatorMm) st.peakRadiatorMm = peakA * toUnit;
    if (peakX > this.traceX) this.traceX = peakX;
    if (vented && peakA * toUnit > this.tracePort) this.tracePort = peakA * toUnit;
  }

  /** xAbs, aux, dem[k]: the worst lane's |excursion|, |outlet| and |demanded drive| in frame k (only when a limit is crossed). */
  private worstLane(lanes: DriverLane[], n: number): void {
    const xAbs = this.xAbs,
      aux = this.aux,
      dem = this.dem;
    for (let w = 0; w < lanes.length; w++) {
      const lane = lanes[w];
      const lx = lane.x,
        lp = lane.outlet,
        ld = lane.uDel;
      const first = w === 0;
      for (let k = 0; k < n; k++) {
        const xv = lx[k] < 0 ? -lx[k] : lx[k];
        const av = lp[k] < 0 ? -lp[k] : lp[k];
        const dv = ld[k] < 0 ? -ld[k] : ld[k];
        if (first || xv > xAbs[k]) xAbs[k] = xv;
        if (first || av > aux[k]) aux[k] = av;
        if (first || dv > dem[k]) dem[k] = dv;
      }
    }
  }
}

export function emptyWayStats(name: string, outlet: Outlet): WayStats {
  return {
    name,
    outlet,
    peakExcursionMm: 0,
    peakRadiatorMm: 0,
    peakCoilTempC: 0,
    peakPortSpeed: 0,
    ampClipFrames: 0,
    maxCompressionDb: 0,
  };
}

/**
 * Distortion and compression of the summed output, per metered channel (the worst channel per
 * frame counts): the residual split into its part coherent with the linear output (a level and
 * phase change, reported as compression) and the rest (distortion), over the same window
 * (level/distortion.ts).
 */
export class OutputDistortion {
  private meters: ResidualMeter[] = [];
  readonly ratio = new Float64Array(CHUNK);
  /**
   * The linear output's level after the coherent part of the residual, as a power ratio to its own
   * (the worst channel per frame; 1 where not lowered): its dB are taken only where needed, since
   * -10·log10 falls as the ratio rises (a logarithm per frame was a fifth of a render).
   */
  readonly level = new Float64Array(CHUNK);
  /** Worst ratio since the trace recorder's last point. */
  traceRatio = 0;
  /** Largest output compression so far, dB (the coherent part; the coil's heat is in the linear twin). */
  maxCompressionDb = 0;
  /** Largest distortion ratio so far (energy). */
  maxRatio = 0;
  private readonly ratioLim = Math.pow(10, -DISTORTION_WITHIN_DB / 10);

  constructor(private readonly sampleRate: number) {
    keepShape(this);
  }

  /** Fresh meters for `count` channels. */
  setChannels(count: number, events: EventLog): void {
    this.maxCompressionDb = this.maxRatio = 0;
    this.meters = Array.from({ length: count }, () => new ResidualMeter(this.sampleRate, DISTORTION_WINDOW_S));
    events.setLimit(OUTPUT_SOURCE, EV_DISTORTION, -DISTORTION_WITHIN_DB);
    events.setLimit(OUTPUT_SOURCE, EV_COMPRESSION, OUTPUT_COMPRESSION_LIMIT_DB);
  }

  measure(out: Float64Array[], linear: Float64Array[], residual: Float64Array[], n: number, t0: number, dt: number, ev: EventLog): void {
    const floor2 = DISTORTION_FLOOR_PA * DISTORTION_FLOOR_PA;
    const ratio = this.ratio,
      level = this.level;
    ratio.fill(0, 0, n);
    level.fill(1, 0, n);
    for (let c = 0; c < this.meters.length; c++) this.meters[c].processBlock(out[c], linear[c], residual[c], n, floor2, ratio, level, true);
    let peakR = 0,
      lowest = 1;
    for (let k = 0; k < n; k++) {
      if (ratio[k] > peakR) peakR = ratio[k];
      if (level[k] < lowest) lowest = level[k];
    }
    const peakL = lowest < 1 ? -10 * Math.log10(lowest) : 0;
    const ratioLim = this.ratioLim;
    if (peakR > ratioLim) {
      for (let k = 0; k < n; k++) if (ratio[k] > ratioLim) ev.mark(OUTPUT_SOURCE, EV_DISTORTION, t0 + k * dt, 10 * Math.log10(ratio[k]));
    }
    if (peakL > OUTPUT_COMPRESSION_LIMIT_DB) {
      for (let k = 0; k < n; k++) {
        if (!(level[k] < 1)) continue;
        const l = -10 * Math.log10(level[k]);
        if (l > OUTPUT_COMPRESSION_LIMIT_DB) ev.mark(OUTPUT_SOURCE, EV_COMPRESSION, t0 + k * dt, l);
      }
    }
    if (peakR > this.traceRatio) this.traceRatio = peakR;
    if (peakL > this.maxCompressionDb) this.maxCompressionDb = peakL;
    if (peakR > this.maxRatio) this.maxRatio = peakR;
  }
}
