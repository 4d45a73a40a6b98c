// Alignment suggestions: closed boxes for target Qtc (Small 1972) and vented alignments from
// Thiele's (1971) families, each with a port sized to keep air speed under the limit.
import type { BoxDoc, PortDoc } from '../design/document.ts';
import type { Box, DriverWay, SpeakerSystem } from '../system.ts';
import { qesWithSeries, totalQ } from '../driver.ts';
import { BOX_KINDS } from '../box/index.ts';
import { respond } from '../response/frequency.ts';
import { firstDriverWay, withoutLowpass, HALF_POWER_DB, rolloffHz, PORT_SPEED_LIMIT } from '../response/analyze.ts';
import { abs } from '../complex.ts';

export interface AlignmentSuggestion {
  id: string;
  /** Our label, with the published alignment name where there is one. */
  label: string;
  box: BoxDoc;
  vbL: number;
  f3Hz: number;
  fcHz?: number;
  qtc?: number;
  fbHz?: number;
  portLengthCm?: number;
  /** Why the port is this size, or why the suggestion is limited. */
  note: string;
}

/** Exact F3 of the closed-box 2nd-order high-pass (Small 1972): f3/fc as a function of Qtc. */
export function sealedF3Ratio(qtc: number): number {
  const a = 1 / (qtc * qtc) - 2;
  return Math.sqrt((a + Math.sqrt(a * a + 4)) / 2);
}

/** Vb for a target Qtc (Small 1972): Vb = Vas / ((Qtc/Qts)^2 - 1). */
export const sealedVolumeFor = (vas: number, qts: number, qtc: number): number => vas / ((qtc / qts) ** 2 - 1);

export interface VentedAlignment {
  name: 'QB3' | 'B4' | 'C4';
  alpha: number;
  /** h = fb/fs */
  h: number;
}

/**
 * Lossless vented alignment for total Q `qt` (Thiele 1971). With the normalised polynomial
 * s^4 + a1 s^3 + a2 s^2 + a3 s + 1, a1 = 1/(Qt sqrt h), a3 = sqrt h/Qt, a2 = (alpha + 1 + h^2)/h,
 * |D(jw)|^2 = w^8 + (a1^2 - 2 a2) w^6 + (a2^2 + 2 - 2 a1 a3) w^4 + (a3^2 - 2 a2) w^2 + 1.
 *  - B4 (maximally flat): all three middle terms vanish; Qt = 0.3827, h = 1, alpha = 1.414.
 *  - QB3 (Qt below B4): the w^6 and w^4 terms vanish, the w^2 term stays positive.
 *  - C4 (Qt above B4): |D|^2 follows the 4th-order Chebyshev (equal-ripple) form
 *    w^8 + e(-16k^2 w^6 + 80k^4 w^4 - 128k^6 w^2 + 64k^8) with 64·e·k^8 = 1.
 */
export function ventedAlignment(qt: number): VentedAlignment | null {
  const qtB4 = 1 / (2 * (Math.cos(Math.PI / 8) + Math.cos((3 * Math.PI) / 8))); // 1/a1 of the 4th-order Butterworth: 0.38268
  if (qt <= 0.1 || qt > 0.7) return null;
  if (Math.abs(qt - qtB4) < 1e-3) return { name: 'B4', alpha: Math.SQRT2, h: 1 };
  const q2 = qt * qt;
  if (qt < qtB4) {
    const a2 = Math.sqrt(2 / q2 - 2);
    const h = 1 / (2 * a2 * q2);
    return { name: 'QB3', alpha: a2 * h - 1 - h * h, h };
  }
  // C4: for a trial k the w^4 and w^2 conditions give a2 and h; find k where the w^6 condition holds.
  const residual = (k: number) => {
    const a2 = Math.sqrt(2 / q2 - 2 + 1.25 / k ** 4);
    const h = 2 * q2 * (a2 - 1 / (k * k));
    return { r: 1 / (2 * q2 * h) + 1 / (8 * k ** 6) - a2, a2, h };
  };
  let lo = 0.5;
  let hi = 50;
  if (Math.sign(residual(lo).r) === Math.sign(residual(hi).r)) return null;
  for (let n = 0; n < 200; n++) {
    const mid = Math.sqrt(lo * hi);
    if (Math.sign(residual(mid).r) === Math.sign(residual(lo).r)) lo = mid;
    else hi = mid;
  }
  const { a2, h } = residual(Math.sqrt(lo * hi));
  const alpha = a2 * h - 1 - h * h;
  return alpha > 0 && h > 0 ? { name: 'C4', alpha, h } : null;
}

/** Round up to a half centimetre. */
const halfCm = (cm: number) => Math.ceil(cm * 2) / 2;

/** The way in another box, and the system with that way in place of the original. */
function inBox(system: SpeakerSystem, way: DriverWay, box: Box): { system: SpeakerSystem; way: DriverWay } {
  const moved: DriverWay = { ...way, box };
  return { system: { ...system, ways: system.ways.map((w) => (w === way ? moved : w)) }, way: moved };
}

/**
 * The smallest round port (in 0.5 cm steps, one or two ports) whose peak air speed stays under the
 * limit wherever the driver reaches its rated power or Xmax first. In the lossless-port model the
 * port's volume velocity at a given fb does not depend on its area, so speed scales as 1/Sv.
 * The way's drive keeps its high-pass (it protects the port) and leaves its low-pass out.
 */
function sizePort(system: SpeakerSystem, way: DriverWay, vbL: number, fbHz: number): { ports: PortDoc[]; note: string } {
  const trial: PortDoc = { diameter_cm: 5, count: 1 };
  const d = way.driver;
  const box = BOX_KINDS.vented.build(
    { type: 'vented', vb_l: vbL, fb_hz: fbHz, ports: [trial] },
    { air: system.air, driver: d, rs: system.amplifier.rs },
    'box',
  ).box;
  if (!box || box.type !== 'vented') return { ports: [trial], note: 'port could not be sized' };
  const trial2 = inBox(system, withoutLowpass(way), box);
  let worst = 0;
  for (let f = 10; f <= 400; f *= 1.02) {
    const r = respond(trial2.system, trial2.way, f, 1);
    const vXmax = d.xmax / (Math.SQRT2 * abs(r.excursion));
    const vPe = Math.sqrt(d.pe / (abs(r.current) ** 2 * d.re));
    const v = Math.min(vXmax, vPe);
    worst = Math.max(worst, (Math.SQRT2 * abs(r.outletFlow) * v) / box.sv);
  }
  const svNeeded = (box.sv * worst) / PORT_SPEED_LIMIT;
  for (const count of [1, 2, 3, 4]) {
    const diameter = halfCm(200 * Math.sqrt(svNeeded / count / Math.PI));
    const ports = [{ diameter_cm: diameter, count }];
    const built = BOX_KINDS.vented.build(
      { type: 'vented', vb_l: vbL, fb_hz: fbHz, ports },
      { air: system.air, driver: d, rs: system.amplifier.rs },
      'box',
    );
    if (built.box && !built.issues.some((i) => i.severity === 'error' || i.message.includes('longer than'))) {
      return { ports, note: `port sized for at most ${PORT_SPEED_LIMIT} m/s at the rated power or Xmax, whichever comes first` };
    }
  }
  // No port fast enough fits: offer the largest single port that does, and say how fast it runs.
  for (let diameter = halfCm(200 * Math.sqrt(svNeeded / Math.PI)); diameter >= 2; diameter -= 0.5) {
    const ports = [{ diameter_cm: diameter, count: 1 }];
    const built = BOX_KINDS.vented.build(
      { type: 'vented', vb_l: vbL, fb_hz: fbHz, ports },
      { air: system.air, driver: d, rs: system.amplifier.rs },
      'box',
    );
    if (
      built.box &&
      built.box.type === 'vented' &&
      !built.issues.some((i) => i.severity === 'error' || i.message.includes('longer than'))
    ) {
      const speed = (worst * box.sv) / built.box.sv;
      return {
        ports,
        note: `the largest port that fits reaches about ${speed.toFixed(0)} m/s at the rated power or Xmax: expect port noise at high level, or use a passive radiator`,
      };
    }
  }
  return { ports: [trial], note: 'no round port fits this box at this tuning' };
}

const SEALED_TARGETS: { qtc: number; label: string }[] = [
  { qtc: 0.5, label: 'Sealed, Qtc 0.5 (critically damped)' },
  { qtc: 0.577, label: 'Sealed, Qtc 0.577 (Bessel, flattest delay)' },
  { qtc: 0.707, label: 'Sealed, Qtc 0.707 (Butterworth, maximally flat)' },
  { qtc: 1.0, label: 'Sealed, Qtc 1.0 (compact, 1.25 dB peak)' },
];

/** Boxes for one driver way (by default the first: the bass way of a first-version design). */
export function suggestAlignments(system: SpeakerSystem, way: DriverWay = firstDriverWay(system)): AlignmentSuggestion[] {
  const { amplifier } = system;
  const d = way.driver;
  const qts = totalQ(qesWithSeries(d.qes, d.re, amplifier.rs), d.qms);
  const out: AlignmentSuggestion[] = [];
  const analyseBox = (box: BoxDoc) => {
    const built = BOX_KINDS[box.type].build(box as never, { air: system.air, driver: d, rs: amplifier.rs }, 'box');
    if (!built.box) return NaN;
    const moved = inBox(system, way, built.box);
    return rolloffHz(moved.system, moved.way, HALF_POWER_DB);
  };
  for (const t of SEALED_TARGETS) {
    if (t.qtc <= qts * 1.02) continue;
    const vb = sealedVolumeFor(d.vas, qts, t.qtc);
    const vbL = Number((vb * 1000).toPrecision(3));
    const box: BoxDoc = { type: 'sealed', vb_l: vbL, ql: null, fill: 0 };
    const fc = d.fs * Math.sqrt(1 + d.vas / vb);
    out.push({
      id: `sealed-${t.qtc}`,
      label: t.label,
      box,
      vbL,
      f3Hz: analyseBox(box),
      fcHz: fc,
      qtc: t.qtc,
      note: `lossless, unfilled; f3 = ${sealedF3Ratio(t.qtc).toFixed(3)}·fc for an ideal 2nd-order high-pass`,
    });
  }
  const v = ventedAlignment(qts);
  if (v) {
    const vbL = Number(((d.vas / v.alpha) * 1000).toPrecision(3));
    const fbHz = Number((v.h * d.fs).toPrecision(3));
    const port = sizePort(system, way, vbL, fbHz);
    const box: BoxDoc = { type: 'vented', vb_l: vbL, fb_hz: fbHz, ql: 7, ports: port.ports };
    const built = BOX_KINDS.vented.build(box, { air: system.air, driver: d, rs: amplifier.rs }, 'box').box;
    out.push({
      id: `vented-${v.name}`,
      label: `Vented, ${v.name} (Thiele) for Qts ${qts.toFixed(3)}`,
      box,
      vbL,
      f3Hz: analyseBox(box),
      fbHz,
      portLengthCm: built && built.type === 'vented' ? built.portLength * 100 : undefined,
      note: `alignment for a lossless box; f3 shown with QL 7. ${port.note}`,
    });
  }
  return out;
}
