// A passive ladder in the time domain, between the amplifier (an EMF behind its output resistance)
// and the driver's terminals. Every part is made of branches that are series R-L-C chains (a tank is
// three such branches side by side); each branch is discretised by the trapezoidal rule (companion
// models: v1 = Zeq·i1 + E with Zeq = R + 2L/h + h/(2C) and E from the branch's last current and
// its inductor's and capacitor's last voltages), which is A-stable and of second order, the rule
// the driver's own model uses. Nodal analysis then gives a constant conductance matrix, inverted
// once, and at the driver's port the whole network is a Thevenin source each step:
//   v_port = Vth - Rth·i_driver,  Rth = [G^-1]_NN,  Vth = row N of G^-1 times the source currents,
// so the driver's electrical row takes R + Rth and u = Vth and the coupling stays exact.
import type { DriverWay, LadderPart, SpeakerSystem } from '../system.ts';
import { wooferParams, type ParamOptions, type WooferParams } from './params.ts';
import type { LinearRecurrence } from './linear.ts';
import { keepShape } from '../keep-shape.ts';

/** Below this the amplifier's output resistance is taken as this (a stiff source, far under any part). */
const MIN_SOURCE_OHM = 1e-6;

interface Branch {
  a: number;
  /** -1 = ground. */
  b: number;
  r: number;
  l: number;
  c: number;
}

/** The ladder's branches and node count: node 0 is the amplifier's terminal, the last node the driver's. */
function branchesOf(parts: readonly LadderPart[]): { branches: Branch[]; nodes: number; partOf: number[] } {
  const branches: Branch[] = [];
  const partOf: number[] = [];
  let node = 0;
  let nodes = 1;
  parts.forEach((p, k) => {
    const a = node;
    let b = -1;
    if (p.at === 'series') {
      b = nodes++;
      node = b;
    }
    const push = (r: number, l: number, c: number) => {
      branches.push({ a, b, r, l, c });
      partOf.push(k);
    };
    switch (p.part) {
      case 'l':
        push(p.dcr, p.l, 0);
        break;
      case 'c':
        push(0, 0, p.c);
        break;
      case 'r':
        push(p.r, 0, 0);
        break;
      case 'rc':
        push(p.r, 0, p.c);
        break;
      case 'rlc':
        push(p.r + p.dcr, p.l, p.c);
        break;
      case 'lc-parallel':
        push(p.dcr, p.l, 0);
        push(0, 0, p.c);
        if (p.r > 0) push(p.r, 0, 0);
        break;
    }
  });
  return { branches, nodes, partOf };
}

/** Inverts a small dense matrix (Gauss-Jordan, partial pivoting); done once per design. */
function invert(m: Float64Array, n: number): Float64Array {
  const a = Float64Array.from(m);
  const inv = new Float64Array(n * n);
  for (let k = 0; k < n; k++) inv[k * n + k] = 1;
  for (let col = 0; col < n; col++) {
    let piv = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(a[r * n + col]) > Math.abs(a[piv * n + col])) piv = r;
    for (let j = 0; j < n; j++) {
      [a[col * n + j], a[piv * n + j]] = [a[piv * n + j], a[col * n + j]];
      [inv[col * n + j], inv[piv * n + j]] = [inv[piv * n + j], inv[col * n + j]];
    }
    const d = a[col * n + col];
    for (let j = 0; j < n; j++) {
      a[col * n + j] /= d;
      inv[col * n + j] /= d;
    }
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = a[r * n + col];
      if (f === 0) continue;
      for (let j = 0; j < n; j++) {
        a[r * n + j] -= f * a[col * n + j];
        inv[r * n + j] -= f * inv[col * n + j];
      }
    }
  }
  return inv;
}

export class LadderSim {
  /** Thevenin resistance at the driver's port, ohm (constant for one step length). */
  readonly rth: number;
  private readonly nb: number;
  private readonly nn: number;
  private readonly ba: Int32Array;
  private readonly bb: Int32Array;
  /** Per branch: conductance 1/Zeq, 2L/h, h/(2C) (0 without a capacitor). */
  private readonly g: Float64Array;
  private readonly kl: Float64Array;
  private readonly kc: Float64Array;
  /** Per branch state: current, inductor voltage, capacitor voltage; and this step's history E. */
  private readonly bi: Float64Array;
  private readonly vl: Float64Array;
  private readonly vc: Float64Array;
  private readonly e: Float64Array;
  private readonly ginv: Float64Array;
  private readonly gs: number;
  /** Node injections and node voltages of the current step. */
  private readonly j: Float64Array;
  private readonly v: Float64Array;
  /** Which part each branch belongs to (for the parts' stress). */
  readonly partOf: Int32Array;
  readonly parts: number;

  constructor(parts: readonly LadderPart[], sourceOhm: number, h: number) {
    const { branches, nodes, partOf } = branchesOf(parts);
    const nb = branches.length;
    this.nb = nb;
    this.nn = nodes;
    this.parts = parts.length;
    this.partOf = Int32Array.from(partOf);
    this.ba = Int32Array.from(branches, (b) => b.a);
    this.bb = Int32Array.from(branches, (b) => b.b);
    this.kl = Float64Array.from(branches, (b) => (2 * b.l) / h);
    this.kc = Float64Array.from(branches, (b) => (b.c > 0 ? h / (2 * b.c) : 0));
    this.g = Float64Array.from(branches, (b, k) => 1 / Math.max(b.r + this.kl[k] + this.kc[k], 1e-9));
    this.bi = new Float64Array(nb);
    this.vl = new Float64Array(nb);
    this.vc = new Float64Array(nb);
    this.e = new Float64Array(nb);
    this.j = new Float64Array(nodes);
    this.v = new Float64Array(nodes);
    this.gs = 1 / Math.max(sourceOhm, MIN_SOURCE_OHM);
    const G = new Float64Array(nodes * nodes);
    G[0] += this.gs;
    for (let k = 0; k < nb; k++) {
      const a = this.ba[k],
        b = this.bb[k],
        g = this.g[k];
      G[a * nodes + a] += g;
      if (b >= 0) {
        G[b * nodes + b] += g;
        G[a * nodes + b] -= g;
        G[b * nodes + a] -= g;
      }
    }
    this.ginv = invert(G, nodes);
    this.rth = this.ginv[nodes * nodes - 1];
    keepShape(this);
  }

  reset(): void {
    this.bi.fill(0);
    this.vl.fill(0);
    this.vc.fill(0);
  }

  /** The open-circuit voltage at the driver's port for the amplifier's EMF `u` this step, V. */
  thevenin(u: number): number {
    const nb = this.nb,
      nn = this.nn,
      j = this.j,
      e = this.e;
    j.fill(0);
    j[0] = u * this.gs;
    for (let k = 0; k < nb; k++) {
      // v1 = Zeq·i1 + E: E = -2L/h·i0 - vL0 + vC0 + h/(2C)·i0.
      const ek = -this.kl[k] * this.bi[k] - this.vl[k] + this.vc[k] + this.kc[k] * this.bi[k];
      e[k] = ek;
      const ge = this.g[k] * ek;
      j[this.ba[k]] += ge;
      if (this.bb[k] >= 0) j[this.bb[k]] -= ge;
    }
    const row = (nn - 1) * nn;
    let vth = 0;
    for (let c = 0; c < nn; c++) vth += this.ginv[row + c] * j[c];
    return vth;
  }

  /** Completes the step once the driver's current `iDriver` (A, into its terminals) is known. */
  advance(iDriver: number): void {
    const nb = this.nb,
      nn = this.nn,
      v = this.v,
      gi = this.ginv,
      j = this.j;
    j[nn - 1] -= iDriver;
    for (let r = 0; r < nn; r++) {
      let acc = 0;
      for (let c = 0; c < nn; c++) acc += gi[r * nn + c] * j[c];
      v[r] = acc;
    }
    for (let k = 0; k < nb; k++) {
      const vb = v[this.ba[k]] - (this.bb[k] >= 0 ? v[this.bb[k]] : 0);
      const i0 = this.bi[k];
      const i1 = this.g[k] * (vb - this.e[k]);
      this.vl[k] = this.kl[k] * (i1 - i0) - this.vl[k];
      this.vc[k] += this.kc[k] * (i1 + i0);
      this.bi[k] = i1;
    }
  }

  /** Current through branch k after the last step, A. */
  branchCurrent(k: number): number {
    return this.bi[k];
  }

  get branches(): number {
    return this.nb;
  }
}

/**
 * The large-signal constants of a driver way: with a passive network, the network's Thevenin
 * resistance stands where the amplifier's output resistance stood (it is in the network's source).
 */
export function wayParams(sys: SpeakerSystem, way: DriverWay, h: number, opt: ParamOptions = {}): WooferParams {
  if (!way.network) return wooferParams(sys, way, h, opt);
  const rth = new LadderSim(way.network, sys.amplifier.rs, h).rth;
  const p = wooferParams({ ...sys, amplifier: { ...sys.amplifier, rs: rth } }, way, h, opt);
  // The electrical row's weight stays the driver's own: the network's resistance would push it
  // towards backward Euler, whose damping costs the top octave (0.5 dB more at 10 kHz at 48 kHz).
  return { ...p, thetaE: wooferParams(sys, way, h, opt).thetaE };
}

/**
 * The linear twin of a passive way: the driver's state-space recurrence behind its own copy of the
 * network, coupled sample by sample as the full model is.
 */
export class LinearBehindLadder {
  readonly net: LadderSim;

  constructor(
    readonly lin: LinearRecurrence,
    parts: readonly LadderPart[],
    sourceOhm: number,
    h: number,
  ) {
    this.net = new LadderSim(parts, sourceOhm, h);
    keepShape(this);
  }

  /** u[k] amplifier EMF, V; out[k] seat pressure, Pa (may be the same array). */
  processBlock(u: Float64Array, out: Float64Array, n: number): void {
    const net = this.net,
      lin = this.lin;
    for (let k = 0; k < n; k++) {
      out[k] = lin.step(net.thevenin(u[k]));
      net.advance(lin.i);
    }
  }
}
