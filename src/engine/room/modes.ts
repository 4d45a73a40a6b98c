// The low-frequency field of a rectangular room by its modes (Morse and Ingard, "Theoretical
// Acoustics", ch. 9; Kuttruff, "Room Acoustics", ch. 3). A point source of volume velocity Q at r0
// gives, for e^(jwt) phasors,
//   p(r) = jw·rho·c^2/V · sum_n eps_n·psi_n(r0)·psi_n(r) / (w_n^2 - w^2 + 2j·delta·w),
//   psi_n = cos(nx pi x/Lx)·cos(ny pi y/Ly)·cos(nz pi z/Lz), eps_n = product of 1 (index 0) or 2,
//   f_n = c/2·sqrt((nx/Lx)^2 + (ny/Ly)^2 + (nz/Lz)^2).
// Every mode decays at delta = 3·ln10/T60 with T60 from Eyring's formula (Eyring 1930):
//   T60 = 24·ln10·V / (c·(-S·ln(1 - alpha))), alpha the area-weighted mean absorption;
// with walls of reflection factor beta this is the decay of the image sources (alpha = 1 - beta^2),
// which Sabine's -S·ln(1 - alpha) ≈ S·alpha only approaches for small alpha.
// The room is a stage on the design's own output: the design's seat pressure at its distance r_d in
// its solid angle Omega, p_d = jw·rho·Q/(Omega·r_d), gives the speaker's volume velocity
// Q = p_d·Omega·r_d/(jw·rho), so the room's transfer from p_d to the seat is
//   H(w) = Omega·r_d·c^2/V · sum_n eps_n·psi_n(r0)·psi_n(r) / (w_n^2 - w^2 + 2j·delta·w),
// a sum of second-order low-pass resonances (the render's resonator bank). Above the Schroeder
// frequency the modes overlap; there H turns, through a Linkwitz-Riley crossover at f_S, into the
// energy sum of the direct field and the reverberant field: |p_rev|^2 = 4·rho·c·W/A (Kuttruff ch. 5)
// with W the source's power in Omega, which gives |H|^2 = (r_d/r)^2 + 4·Omega·r_d^2/A. The modes'
// branch is also smoothed above twice the transition, so the render can run it at a low rate.
import type { ActiveFilter, Air, Listening, Room, RoomSurface, Vec3 } from '../system.ts';
import { add, cx, mul, scale, type Complex } from '../complex.ts';
import { wayFilterAt } from '../filters/way-filter.ts';

export interface RoomMode {
  nx: number;
  ny: number;
  nz: number;
  hz: number;
}

/** Modes are summed up to this multiple of the Schroeder frequency (Kuttruff: the modal region ends there; the sum needs its neighbours above). */
export const MODES_TO_SCHROEDER = 2;
/** The modes' branch is smoothed at this multiple of the transition (room/stage.ts: its low rate). */
export const SMOOTH_TO_TRANSITION = 2;
/**
 * The modes above the sum still add their stiffness far below their resonance; they are summed as one
 * constant up to this multiple of the Schroeder frequency (at most MAX_TAIL_MODES of them).
 */
export const TAIL_TO_SCHROEDER = 12;
export const MAX_TAIL_MODES = 200000;
/** At most this many modes (a large, live room): the sum then stops at the highest mode kept. */
export const MAX_MODES = 1500;
/**
 * The (0, 0, 0) mode is the room's compliance; a real room leaks, and a resonance at 0 Hz would be an
 * integrator in the render. It is given this frequency instead (our choice: far under the audio band,
 * it changes the compression term by (3/f)^2, 1% at 30 Hz).
 */
export const ROOM_LEAK_HZ = 3;

/** Mode frequency, Hz: c/2·sqrt((nx/Lx)^2 + (ny/Ly)^2 + (nz/Lz)^2). */
export const modeHz = (c: number, size: Vec3, nx: number, ny: number, nz: number): number =>
  (c / 2) * Math.sqrt((nx / size[0]) ** 2 + (ny / size[1]) ** 2 + (nz / size[2]) ** 2);

export const roomVolume = (room: Room): number => room.size[0] * room.size[1] * room.size[2];

/** Area of each surface, m^2. */
function surfaceAreas(room: Room): Record<RoomSurface, number> {
  const [lx, ly, lz] = room.size;
  return { floor: lx * ly, ceiling: lx * ly, front: ly * lz, back: ly * lz, left: lx * lz, right: lx * lz };
}

export interface Reverberation {
  /** Total surface, m^2. */
  surface: number;
  /** Area-weighted mean absorption coefficient. */
  meanAbsorption: number;
  /** Eyring's equivalent absorption area -S·ln(1 - alpha), m^2. */
  absorptionArea: number;
  /** Eyring reverberation time, s. */
  t60: number;
  /** Amplitude decay constant of every mode, 1/s. */
  delta: number;
}

export function reverberation(room: Room, c: number): Reverberation {
  const areas = surfaceAreas(room);
  let surface = 0;
  let absorbed = 0;
  for (const s of Object.keys(areas) as RoomSurface[]) {
    surface += areas[s];
    absorbed += areas[s] * room.absorption[s];
  }
  const meanAbsorption = absorbed / surface;
  const absorptionArea = -surface * Math.log(1 - meanAbsorption);
  // Eyring (1930): T60 = 24·ln10·V/(c·A).
  const t60 = (24 * Math.LN10 * roomVolume(room)) / (c * absorptionArea);
  return { surface, meanAbsorption, absorptionArea, t60, delta: (3 * Math.LN10) / t60 };
}

/** Schroeder frequency, Hz: 2000·sqrt(T60/V) (Schroeder and Kuttruff 1962; T60 in s, V in m^3). */
export const schroederHz = (t60: number, volume: number): number => 2000 * Math.sqrt(t60 / volume);

/** Every mode up to fMaxHz, lowest first, at most MAX_MODES (the (0,0,0) mode included, at 0 Hz). */
export function roomModes(size: Vec3, c: number, fMaxHz: number): RoomMode[] {
  const modes: RoomMode[] = [];
  forEachMode(size, c, fMaxHz, (nx, ny, nz, hz) => modes.push({ nx, ny, nz, hz }));
  modes.sort((a, b) => a.hz - b.hz);
  return modes.slice(0, MAX_MODES);
}

/** Visits every mode up to fMaxHz (in index order, at most MAX_TAIL_MODES of them). */
function forEachMode(size: Vec3, c: number, fMaxHz: number, visit: (nx: number, ny: number, nz: number, hz: number) => void): void {
  const top = (l: number) => Math.floor((2 * fMaxHz * l) / c);
  let count = 0;
  for (let nx = 0; nx <= top(size[0]); nx++)
    for (let ny = 0; ny <= top(size[1]); ny++)
      for (let nz = 0; nz <= top(size[2]); nz++) {
        const hz = modeHz(c, size, nx, ny, nz);
        if (hz > fMaxHz) continue;
        if (++count > MAX_TAIL_MODES) return;
        visit(nx, ny, nz, hz);
      }
}

/** One speaker to the seat: the room as resonances K_n/(s^2 + 2·delta·s + w_n^2), and the crossover to the diffuse field. */
export interface RoomPath {
  /** Mode angular frequencies, rad/s (the (0,0,0) mode at the leak frequency). */
  w: Float64Array;
  /** Residues K_n, 1/s^2 (dimensionless H). */
  k: Float64Array;
  /** The modes above the sum, far under their resonances: a constant sum_n K_n/w_n^2 (residual flexibility). */
  residual: number;
  delta: number;
  /** The crossover frequency, Hz: the Schroeder frequency. */
  transitionHz: number;
  /** |H| above the transition: the direct and the reverberant field's energies, relative to the design's own seat pressure. */
  diffuseGain: number;
  /** The crossover between the modes and the diffuse field: a fourth-order Linkwitz-Riley pair at the transition. */
  low: ActiveFilter;
  high: ActiveFilter;
  /** A fourth-order Butterworth low-pass at twice the transition on the modes' branch: it lets the render run the modes at a low rate. */
  smooth: ActiveFilter;
}

export interface RoomModel {
  modes: RoomMode[];
  reverb: Reverberation;
  schroederHz: number;
  /** One path per speaker (left, right). */
  paths: RoomPath[];
}

const cosMode = (n: number, x: number, l: number): number => (n === 0 ? 1 : Math.cos((n * Math.PI * x) / l));

/**
 * sum eps_n·psi_n(src)·psi_n(seat)/w_n^2 over the modes from fromHz (exclusive) to toHz, at most
 * MAX_TAIL_MODES of them; the cosines come from one table per axis (tens of thousands of modes).
 */
function tailSum(room: Room, src: Vec3, c: number, fromHz: number, toHz: number): number {
  const axis = (i: number) => {
    const l = room.size[i];
    const top = Math.floor((2 * toHz * l) / c);
    const product = new Float64Array(top + 1);
    const k2 = new Float64Array(top + 1);
    for (let n = 0; n <= top; n++) {
      product[n] = (n ? 2 : 1) * cosMode(n, src[i], l) * cosMode(n, room.seat[i], l);
      k2[n] = ((n * Math.PI) / l) ** 2;
    }
    return { product, k2, top };
  };
  const [ax, ay, az] = [axis(0), axis(1), axis(2)];
  // w_n^2 = c^2·k^2; the bounds compare k^2 with (2 pi f / c)^2.
  // (A hair above fromHz, so the mode at fromHz, already in the sum, is not counted twice.)
  const from2 = ((2 * Math.PI * fromHz) / c) ** 2 * (1 + 1e-9);
  const to2 = ((2 * Math.PI * toHz) / c) ** 2;
  let sum = 0;
  let count = 0;
  for (let nx = 0; nx <= ax.top; nx++)
    for (let ny = 0; ny <= ay.top; ny++) {
      const kxy = ax.k2[nx] + ay.k2[ny];
      if (kxy > to2) break;
      const pxy = ax.product[nx] * ay.product[ny];
      for (let nz = 0; nz <= az.top; nz++) {
        const k2 = kxy + az.k2[nz];
        if (k2 > to2) break;
        if (k2 <= from2) continue;
        if (++count > MAX_TAIL_MODES) return sum / (c * c);
        sum += (pxy * az.product[nz]) / k2;
      }
    }
  return sum / (c * c);
}

/** The modal model of the listening room, or null when the design has none. */
export function roomModel(listening: Listening, air: Air): RoomModel | null {
  const room = listening.room;
  if (!room) return null;
  const c = air.c;
  const volume = roomVolume(room);
  const reverb = reverberation(room, c);
  const fS = schroederHz(reverb.t60, volume);
  const modes = roomModes(room.size, c, MODES_TO_SCHROEDER * fS);
  const topHz = modes[modes.length - 1].hz;
  const transitionHz = Math.min(fS, topHz / MODES_TO_SCHROEDER);
  const rd = listening.distance;
  const paths = room.speakers.map((src): RoomPath => {
    const w = new Float64Array(modes.length);
    const k = new Float64Array(modes.length);
    const eps = (m: RoomMode) => (m.nx ? 2 : 1) * (m.ny ? 2 : 1) * (m.nz ? 2 : 1);
    const shape = (m: RoomMode, p: Vec3) =>
      cosMode(m.nx, p[0], room.size[0]) * cosMode(m.ny, p[1], room.size[1]) * cosMode(m.nz, p[2], room.size[2]);
    const scaleK = (listening.omega * rd * c * c) / volume;
    modes.forEach((m, i) => {
      w[i] = 2 * Math.PI * (i === 0 && m.hz === 0 ? ROOM_LEAK_HZ : m.hz);
      k[i] = scaleK * eps(m) * shape(m, src) * shape(m, room.seat);
    });
    // The modes above, far below their resonances, act as one constant: sum K_n/w_n^2.
    const residual = tailSum(room, src, c, topHz, TAIL_TO_SCHROEDER * fS) * scaleK;
    const r = Math.hypot(src[0] - room.seat[0], src[1] - room.seat[1], src[2] - room.seat[2]);
    const diffuseGain = Math.sqrt((rd / r) ** 2 + (4 * listening.omega * rd * rd) / reverb.absorptionArea);
    const band = { shape: 'lr4' as const, hz: transitionHz };
    const low: ActiveFilter = { type: 'active', highpass: null, lowpass: band, gain: 1, delay: 0 };
    const high: ActiveFilter = { type: 'active', highpass: band, lowpass: null, gain: 1, delay: 0 };
    const smooth: ActiveFilter = {
      type: 'active',
      highpass: null,
      lowpass: { shape: 'bw4', hz: SMOOTH_TO_TRANSITION * transitionHz },
      gain: 1,
      delay: 0,
    };
    return { w, k, residual, delta: reverb.delta, transitionHz, diffuseGain, low, high, smooth };
  });
  return { modes, reverb, schroederHz: fS, paths };
}

/** The modal sum alone at w rad/s: the room's transfer from the design's own seat pressure. */
export function modalSumAt(path: RoomPath, w: number): Complex {
  let re = path.residual;
  let im = 0;
  const d2w = 2 * path.delta * w;
  for (let i = 0; i < path.w.length; i++) {
    // K/(a + jb) = K·(a - jb)/(a^2 + b^2)
    const a = path.w[i] * path.w[i] - w * w;
    const g = path.k[i] / (a * a + d2w * d2w);
    re += g * a;
    im -= g * d2w;
  }
  return cx(re, im);
}

/** The room's whole transfer at f Hz from the design's own seat pressure to the seat in the room. */
export function roomTransferAt(path: RoomPath, f: number): Complex {
  const w = 2 * Math.PI * f;
  const { low, high, smooth } = path;
  return add(mul(mul(wayFilterAt(low, w), wayFilterAt(smooth, w)), modalSumAt(path, w)), scale(wayFilterAt(high, w), path.diffuseGain));
}

/** Level change the room makes at f, dB (|H| in dB). */
export const roomGainDb = (path: RoomPath, f: number): number => {
  const h = roomTransferAt(path, f);
  return 10 * Math.log10(h.re * h.re + h.im * h.im);
};
