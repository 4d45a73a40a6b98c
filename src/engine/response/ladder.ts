// A passive ladder network at one frequency, by two-port (ABCD, chain) matrices: a series impedance
// Z is [[1, Z], [0, 1]], a shunt admittance Y is [[1, 0], [Y, 1]], a cascade is their product in
// order, and with V1 = A·V2 + B·I2, I1 = C·V2 + D·I2 (I2 out of port 2) a load ZL gives
// V2/V1 = ZL/(A·ZL + B) and Zin = (A·ZL + B)/(C·ZL + D) (standard two-port circuit theory).
// Seen from its output, the source behind the ladder is a Thevenin source V1/A with impedance B/A.
import type { LadderPart } from '../system.ts';
import { add, cx, div, hypot, inv, mul, type Complex } from '../complex.ts';

export interface Abcd {
  a: Complex;
  b: Complex;
  c: Complex;
  d: Complex;
}

/** The part's own impedance at w rad/s (inductors with their winding resistance). */
export function partImpedance(p: LadderPart, w: number): Complex {
  const zl = cx(p.dcr, w * p.l);
  const zc = cx(0, -1 / (w * p.c));
  switch (p.part) {
    case 'l':
      return zl;
    case 'c':
      return zc;
    case 'r':
      return cx(p.r);
    case 'rc':
      return add(cx(p.r), zc);
    case 'rlc':
      return add(add(cx(p.r), zl), zc);
    case 'lc-parallel': {
      // A tank: admittances add; its optional resistor across it sets the depth.
      let y = add(inv(zl), inv(zc));
      if (p.r > 0) y = add(y, cx(1 / p.r));
      return inv(y);
    }
  }
}

const IDENTITY: Abcd = { a: cx(1), b: cx(0), c: cx(0), d: cx(1) };

function chain(m: Abcd, n: Abcd): Abcd {
  return {
    a: add(mul(m.a, n.a), mul(m.b, n.c)),
    b: add(mul(m.a, n.b), mul(m.b, n.d)),
    c: add(mul(m.c, n.a), mul(m.d, n.c)),
    d: add(mul(m.c, n.b), mul(m.d, n.d)),
  };
}

/** The ladder's chain matrix at w, from `sourceOhm` (the amplifier's output resistance) to the driver terminals. */
export function ladderAbcd(parts: readonly LadderPart[], w: number, sourceOhm = 0): Abcd {
  let m = sourceOhm > 0 ? { ...IDENTITY, b: cx(sourceOhm) } : IDENTITY;
  for (const p of parts) {
    const z = partImpedance(p, w);
    m = chain(m, p.at === 'series' ? { ...IDENTITY, b: z } : { ...IDENTITY, c: inv(z) });
  }
  return m;
}

/** The source and the ladder seen from the driver terminals: open-circuit volts per source volt and the impedance. */
export function ladderThevenin(parts: readonly LadderPart[], w: number, sourceOhm: number): { gain: Complex; z: Complex } {
  const m = ladderAbcd(parts, w, sourceOhm);
  return { gain: inv(m.a), z: div(m.b, m.a) };
}

/** The impedance the amplifier sees: the ladder loaded by `load` (its own output resistance excluded). */
export function ladderInputImpedance(parts: readonly LadderPart[], w: number, load: Complex): Complex {
  const m = ladderAbcd(parts, w);
  return div(add(mul(m.a, load), m.b), add(mul(m.c, load), m.d));
}

/** Current through and voltage across one part, rms phasors. */
export interface PartState {
  current: Complex;
  voltage: Complex;
}

/**
 * Every part's current and voltage for the driver terminals at `v2` with `i2` flowing into the
 * drivers: walked back from the load towards the amplifier (a series part carries the line current,
 * a shunt part sees the line voltage).
 */
export function ladderStates(parts: readonly LadderPart[], w: number, v2: Complex, i2: Complex): PartState[] {
  const out: PartState[] = new Array(parts.length);
  let v = v2;
  let i = i2;
  for (let k = parts.length - 1; k >= 0; k--) {
    const z = partImpedance(parts[k], w);
    if (parts[k].at === 'series') {
      const drop = mul(z, i);
      out[k] = { current: i, voltage: drop };
      v = add(v, drop);
    } else {
      const branch = div(v, z);
      out[k] = { current: branch, voltage: v };
      i = add(i, branch);
    }
  }
  return out;
}

/** Real power a part turns into heat, W: |I|^2·Re(Z) (its resistor and its inductor's winding). */
export function partPower(p: LadderPart, w: number, s: PartState): number {
  const z = partImpedance(p, w);
  return (s.current.re ** 2 + s.current.im ** 2) * z.re;
}

/** A short name for a part: its place in the ladder and what it is ("2 shunt C"). */
export function partLabel(p: LadderPart, index: number): string {
  return `${index + 1} ${p.at} ${p.part.toUpperCase()}`;
}

/**
 * Whether a ladder passes bass: its open-circuit transfer at 20 Hz above that at 20 kHz (a low-pass
 * or a plain pad), so the way plays the low end.
 */
export function ladderPassesBass(parts: readonly LadderPart[]): boolean {
  const at = (f: number) => {
    const g = ladderThevenin(parts, 2 * Math.PI * f, 0).gain;
    return hypot(g.re, g.im);
  };
  return at(20) >= at(20000);
}
