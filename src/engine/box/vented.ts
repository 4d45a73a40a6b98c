import * as v from 'valibot';
import type { PortDoc } from '../design/document.ts';
import { num, portsSchema, qlSchema, volumeSchema } from '../design/schema.ts';
import type { BoxKind } from './types.ts';
import { boxCompliance, DEFAULT_QL, leakageResistance } from './common.ts';
import { error, fmt, warning, type Issue } from '../issues.ts';
import { cx, inv } from '../complex.ts';
import { oneChamberAcoustics, PortedChamber } from './one-chamber.ts';
import { PORT_SPEED_LIMIT } from '../units.ts';

export interface VentedBox {
  type: 'vented';
  vb: number;
  vbNet: number;
  ral: number;
  ql: number | null;
  fb: number;
  /** Total port area, m^2. */
  sv: number;
  portCount: number;
  /** Area of one port, m^2. */
  portArea: number;
  /** Equivalent radius of one port (for end corrections), m. */
  portRadius: number;
  /** Physical length of one port, m (may be negative if the tuning is impossible; validation reports it). */
  portLength: number;
  /** Effective acoustic length (physical + end corrections), m. */
  portLeff: number;
  /** Acoustic mass of all ports together, kg/m^4. */
  map: number;
  /** Loss coefficient of the ports' ends (port compression). */
  portLossK: number;
}

const schema = v.strictObject({
  type: v.literal('vented'),
  vb_l: volumeSchema,
  fb_hz: num(5, 2000, 'Hz'),
  ql: qlSchema,
  ports: portsSchema,
});

/** End corrections per unit radius. Flanged: Rayleigh's 8/(3 pi); free: Levine & Schwinger (1948). */
export const END_CORRECTION = { flanged: 8 / (3 * Math.PI), free: 0.6133 } as const;

export interface PortGeometry {
  area: number;
  /** Radius of the circle of equal area (the usual approximation for slots), m. */
  radius: number;
  count: number;
  /** Sum of both end corrections, m. */
  endCorrection: number;
  /** Loss coefficient of its ends. */
  lossK: number;
}

export function portGeometry(port: PortDoc): PortGeometry {
  const area =
    port.diameter_cm !== undefined ? Math.PI * (port.diameter_cm / 200) ** 2 : ((port.width_cm ?? 0) / 100) * ((port.height_cm ?? 0) / 100);
  const radius = Math.sqrt(area / Math.PI);
  const endCorrection = radius * (END_CORRECTION[port.outer_end ?? 'flanged'] + END_CORRECTION[port.inner_end ?? 'free']);
  return { area, radius, count: port.count ?? 1, endCorrection, lossK: PORT_LOSS_K[port.end_shape ?? 'sharp'] };
}

/**
 * Loss coefficient K of a port's Δp = ½·rho·K·u·|u| by the shape of its ends. Sharp edges: K of
 * order 1 (Backman, AES 1995); rounded and flared ends shed less of the jet and compress less
 * (Salvatti, Devantier & Button, JAES 2002): 0.5 and 0.2 are our estimates within the lower range
 * those measurements show (from memory, not read off a table).
 */
export const PORT_LOSS_K = { sharp: 1.0, rounded: 0.5, flared: 0.2 } as const;

/** The ports' loss coefficient: the area-weighted mean of their K (all ports carry the same speed). */
export const portsLossK = (ports: PortGeometry[]): number =>
  ports.reduce((s, p) => s + p.lossK * p.area * p.count, 0) / ports.reduce((s, p) => s + p.area * p.count, 0);

/** The first pipe resonance of a port open at both ends, c/(2·Leff) Hz: port noise can ring there. */
export const pipeResonanceHz = (c: number, leff: number): number => c / (2 * leff);

/** Helmholtz resonance of a box with one port of effective length leff: fb = c/(2 pi)·sqrt(Sv/(Vb·Leff)). */
export const helmholtzHz = (c: number, sv: number, vb: number, leff: number): number => (c / (2 * Math.PI)) * Math.sqrt(sv / (vb * leff));

/**
 * Physical length L shared by all ports that tunes the box to fb:
 * sum_i count_i·S_i/(L + delta_i) = (2 pi fb)^2·Vb/c^2 (parallel acoustic masses).
 * Negative when the ports are too small for fb: even at zero length their end corrections alone tune lower.
 */
export function portLengthFor(ports: PortGeometry[], vb: number, fb: number, c: number): number {
  const target = ((2 * Math.PI * fb) ** 2 * vb) / (c * c);
  const conductance = (l: number) => ports.reduce((s, p) => s + (p.count * p.area) / (l + p.endCorrection), 0);
  if (conductance(0) < target) {
    // Even at zero length the end corrections tune below fb; return the (negative) length that would fit.
    let lo = -Math.min(...ports.map((p) => p.endCorrection)) + 1e-9;
    let hi = 0;
    for (let k = 0; k < 100; k++) {
      const mid = 0.5 * (lo + hi);
      if (conductance(mid) > target) lo = mid;
      else hi = mid;
    }
    return 0.5 * (lo + hi);
  }
  let lo = 0;
  let hi = 1;
  while (conductance(hi) > target && hi < 1e6) hi *= 2;
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (conductance(mid) > target) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Longest inner dimension of a box of golden proportions 0.618 : 1 : 1.618, m (common practice, no source). */
export const longestInnerDimension = (vb: number): number => 1.618 * Math.cbrt(vb);

export const vented: BoxKind<typeof schema, VentedBox> = {
  type: 'vented',
  label: 'Vented',
  schema,
  build(doc, { air }, path) {
    const issues: Issue[] = [];
    const vbNet = doc.vb_l / 1000;
    const ql = doc.ql === undefined ? DEFAULT_QL : doc.ql;
    const geoms = doc.ports.map(portGeometry);
    const sv = geoms.reduce((s, g) => s + g.area * g.count, 0);
    const portCount = geoms.reduce((s, g) => s + g.count, 0);
    let length = portLengthFor(geoms, vbNet, doc.fb_hz, air.c);
    if (length <= 0) {
      const fbAtZero = helmholtzHz(air.c, sv, vbNet, geoms[0].endCorrection);
      issues.push(
        error(
          `${path}.ports`,
          `ports of ${fmt(sv * 1e4)} cm² in ${fmt(doc.vb_l)} l cannot tune to ${fmt(doc.fb_hz)} Hz: even a zero-length port tunes only to ` +
            `${fmt(fbAtZero)} Hz; use a larger port area or a smaller box`,
        ),
      );
      length = 0;
    }
    // vb_l is the net acoustic volume: the port's own volume must be added to the gross box.
    const vb = vbNet;
    const portVolume = sv * length;
    if (portVolume >= vbNet) {
      issues.push(
        error(
          `${path}.ports`,
          `the ports (${fmt(portVolume * 1000)} l, ${fmt(length * 100)} cm long) are larger than the ${fmt(doc.vb_l)} l box`,
        ),
      );
      return { box: null, issues };
    }
    if (portVolume > 0.15 * vbNet) {
      issues.push(warning(`${path}.ports`, `the ports take ${fmt(portVolume * 1000)} l; the gross box must be that much larger than vb_l`));
    }
    const maxLength = longestInnerDimension(vbNet) - geoms[0].radius;
    if (length > maxLength) {
      issues.push(
        warning(
          `${path}.ports`,
          `each port must be ${fmt(length * 100)} cm long, longer than the box's likely inner depth of about ${fmt(maxLength * 100)} cm; ` +
            'it would need a bend, or use fewer or smaller ports or a lower fb',
        ),
      );
    }
    const cab = boxCompliance(vb, air);
    const wb = 2 * Math.PI * doc.fb_hz;
    const map = 1 / (wb * wb * cab);
    const box: VentedBox = {
      type: 'vented',
      vb,
      vbNet,
      ral: leakageResistance(ql, wb, cab),
      ql,
      fb: doc.fb_hz,
      sv,
      portCount,
      portArea: geoms[0].area,
      portRadius: geoms[0].radius,
      portLength: length,
      portLeff: length + geoms[0].endCorrection,
      map,
      portLossK: portsLossK(geoms),
    };
    return { box, issues };
  },
  // Port as a lossless acoustic mass (its small-signal loss is lumped into QL): Y = 1/(j w Map).
  acoustics: (box, air, w) => oneChamberAcoustics(box.vb, box.ral, air, w, inv(cx(0, w * box.map))),
  chamber: (box, ctx) => new PortedChamber(box.vb, box.ral, box.map, box.sv, box.portLossK, ctx),
  // Port air speed over about 17 m/s (common practice, roughly 5% of c).
  probe: (box) => ({ kind: 'port-speed', toUnit: 1 / box.sv, limit: PORT_SPEED_LIMIT }),
  figures: (box, air) => [
    { id: 'fb', label: 'Tuning fb', value: box.fb, unit: 'Hz' },
    { id: 'port-length', label: 'Port length (each)', value: box.portLength * 100, unit: 'cm' },
    { id: 'pipe-resonance', label: 'Port pipe resonance', value: pipeResonanceHz(air.c, box.portLeff), unit: 'Hz' },
  ],
};
