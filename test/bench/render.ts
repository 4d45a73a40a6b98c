// Renderer benchmarks (DESIGN.md section 9), each a ratio measured side by side in one run:
//  - full large-signal render of the vented example, stereo 48 kHz, one core: times real time; and
//    the same on two threads (the CLI's lane worker) against one, wall time;
//  - the linear chain against node-web-audio-api's OfflineAudioContext running the same biquads
//    (one IIRFilterNode per section): our time / its time;
//  - the nonlinear render per sample as a multiple of one biquad section per sample;
//  - driver models below the audio rate (low-rate-model.ts) against the exact path, on ways whose
//    filter allows 1/8: a woofer crossed at 300 Hz and a bandpass subwoofer (time ratios);
//  - the woofer model against odex at equal accuracy: its time / ours;
//  - peak memory of a 10-minute stereo render against the decoded audio (child process).
import { spawnSync } from 'node:child_process';
import { availableParallelism, loadavg } from 'node:os';
import { laneThread } from '../../src/cli/lane-helper.ts';
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { OfflineAudioContext } from 'node-web-audio-api';
import { renderBuffer } from '../../src/engine/render/index.ts';
import { designLinearChain } from '../../src/engine/render/linear-chain.ts';
import { synthesizeDemoTrack } from '../../src/engine/demo/track.ts';
import { wooferParams } from '../../src/engine/sim/params.ts';
import { WooferSim } from '../../src/engine/sim/woofer.ts';
import { exampleSystem } from '../helpers/audio-bench.ts';
import { system, ventedBox, wooferOf } from '../sim-fixtures.ts';
import { rhs, Solver, stateCount } from '../sim-odex-model.ts';
import { BiquadCascade } from '../../src/engine/filters/biquad.ts';
import { wayFilterBiquads } from '../../src/engine/filters/way-filter.ts';
import type { BenchResult } from './ui-redraw.ts';
import { parseDesign } from '../../src/engine/design/validate.ts';
import type { SpeakerSystem } from '../../src/engine/system.ts';

const HERE = dirname(fileURLToPath(import.meta.url));
const now = () => performance.now();

function best<T>(n: number, f: () => T): { ms: number; value: T } {
  let ms = Infinity,
    value!: T;
  for (let k = 0; k < n; k++) {
    const t0 = now();
    value = f();
    ms = Math.min(ms, now() - t0);
  }
  return { ms, value };
}

/**
 * Best CPU time of this process over n runs after two warm-ups, ms. CPU time, because the machine
 * is shared: under a load of 6 on 2 cores the wall time of the same render read 14.8x real time
 * against 46.5x at a load of 4. Two warm-ups, because the second render in a process is the slow
 * one: V8 drops the cone model's optimised loop ("weak objects": things the code embedded from the
 * first renderer were collected) and that render re-enters the loop by on-stack replacement over
 * and over (node --trace-osr: thousands of lines against 4), 1.4-1.8x slower than the renders
 * after it (two runs, CPU time).
 */
function cpuBest(n: number, f: () => void): number {
  f();
  f();
  let ms = Infinity;
  for (let k = 0; k < n; k++) {
    const c0 = process.cpuUsage();
    f();
    const c = process.cpuUsage(c0);
    ms = Math.min(ms, (c.user + c.system) / 1000);
  }
  return ms;
}

function realtime(): BenchResult {
  const sys = exampleSystem('vented');
  const track = synthesizeDemoTrack(48000);
  const seconds = track.channels[0].length / 48000;
  const ms = cpuBest(3, () => renderBuffer(sys, track.channels, 48000, { splDb: 90 }));
  return {
    name: 'large-signal render, vented, stereo 48 kHz (demo track, 90 dB(C)), CPU time',
    value: Number(((seconds * 1000) / ms).toFixed(1)),
    unit: 'x real time',
    target: '>= 100',
  };
}

/**
 * The same render with a second thread (the CLI's lane worker) against one thread, wall time, best
 * of three each in turns: what the second core buys when it is free (on a busy machine the two
 * threads wait on each other; the loadavg says how busy it was).
 */
function twoThreads(): BenchResult[] {
  const sys = exampleSystem('vented');
  const track = synthesizeDemoTrack(48000);
  const seconds = track.channels[0].length / 48000;
  const helper = laneThread();
  const run = (two: boolean) => () => renderBuffer(sys, track.channels, 48000, { splDb: 90, helper: two ? helper : undefined });
  run(true)();
  run(false)();
  let one = Infinity,
    two = Infinity;
  for (let k = 0; k < 3; k++) {
    one = Math.min(one, best(1, run(false)).ms);
    two = Math.min(two, best(1, run(true)).ms);
  }
  const load = loadavg()[0].toFixed(1);
  return [
    {
      name: `large-signal render as above on two threads, wall time (load ${load} on ${availableParallelism()} cores)`,
      value: Number(((seconds * 1000) / two).toFixed(1)),
      unit: 'x real time',
      target: '>= 100',
    },
    { name: '  one thread, wall time', value: Number(((seconds * 1000) / one).toFixed(1)), unit: 'x real time', target: '' },
    { name: '  two threads / one', value: Number((one / two).toFixed(2)), unit: 'speed ratio', target: '' },
  ];
}

async function linearVsWebAudio(): Promise<BenchResult[]> {
  const sys = exampleSystem('vented');
  const fs = 48000;
  const track = synthesizeDemoTrack(fs);
  const n = track.channels[0].length;
  // The first way: the woofer band (its filter, the driver in its box).
  const design = designLinearChain(sys, fs)[0];
  const sections = design.coef.length / 5;
  // Ours: the woofer band's biquads over both channels (the same sections the native side runs).
  // Ours: the same cascade (crossover low-pass + the design's small-signal transfer) per channel.
  const out = [new Float64Array(n), new Float64Array(n)];
  const ours = best(5, () => {
    for (let c = 0; c < 2; c++) {
      out[c].set(track.channels[c]);
      new BiquadCascade(design.coef, design.gain).processInPlace(out[c]);
    }
    return out;
  });
  // Native: one IIRFilterNode per section, b and a as given (a0 = 1), the same gain on a GainNode.
  let nativeMs = Infinity;
  let native: Float32Array | null = null;
  for (let rep = 0; rep < 5; rep++) {
    const ctx = new OfflineAudioContext({ numberOfChannels: 2, length: n, sampleRate: fs });
    const buf = ctx.createBuffer(2, n, fs);
    buf.copyToChannel(track.channels[0] as Float32Array<ArrayBuffer>, 0);
    buf.copyToChannel(track.channels[1] as Float32Array<ArrayBuffer>, 1);
    const src = ctx.createBufferSource();
    src.buffer = buf;
    let node: AudioNode = src;
    for (let s = 0; s < sections; s++) {
      const c = design.coef.subarray(5 * s, 5 * s + 5);
      const f = ctx.createIIRFilter([c[0], c[1], c[2]], [1, c[3], c[4]]);
      node.connect(f);
      node = f;
    }
    const g = ctx.createGain();
    g.gain.value = design.gain;
    node.connect(g);
    g.connect(ctx.destination);
    src.start();
    const t0 = now();
    const rendered = await ctx.startRendering();
    nativeMs = Math.min(nativeMs, now() - t0);
    native = rendered.getChannelData(0);
  }
  let e = 0,
    s2 = 0;
  for (let k = 0; k < n; k++) {
    e += (native![k] - ours.value[0][k]) ** 2;
    s2 += ours.value[0][k] ** 2;
  }
  return [
    {
      name: `linear chain (${sections} biquads, stereo) / node-web-audio-api OfflineAudioContext`,
      value: Number((ours.ms / nativeMs).toFixed(3)),
      unit: 'time ratio',
      target: '<= 1.0',
    },
    {
      name: '  agreement with the native render (relative RMS difference)',
      value: Number(Math.sqrt(e / s2).toExponential(2)),
      unit: '',
      target: '< 1e-5 (32-bit float)',
    },
  ];
}

async function versusOdex(): Promise<BenchResult[]> {
  // The same nonlinear equations (test/sim-odex-model.ts) on a sampled drive, as audio is: the
  // demo track's woofer band (LR4 at 2 kHz) at about Xmax, linear between samples for odex.
  const fs = 48000;
  const sys = system(ventedBox(28, 38, 7), { d: { xmaxMm: 5, xlimMm: 15 } });
  const p = wooferParams(sys, wooferOf(sys), 1 / fs);
  const track = synthesizeDemoTrack(fs);
  const from = Math.round(track.loudFromS * fs),
    n = Math.round(0.5 * fs);
  const lp = new BiquadCascade(wayFilterBiquads(wooferOf(sys).filter, fs)!);
  const drive = new Float64Array(n);
  for (let k = 0; k < from + n; k++) {
    const v = lp.step(track.channels[0][k]);
    if (k >= from) drive[k - from] = 40 * v;
  }
  const u = (t: number) => {
    const x = t * fs,
      k = Math.floor(x);
    if (k >= n - 1) return drive[n - 1];
    return drive[k] + (x - k) * (drive[k + 1] - drive[k]);
  };
  const { f } = rhs(sys, wooferOf(sys), u);
  const nState = stateCount(wooferOf(sys));
  const solve = (tol: number) => {
    const s = new Solver(nState);
    s.absoluteTolerance = tol * 1e-3;
    s.relativeTolerance = tol;
    s.denseOutput = true;
    s.maxSteps = 1e8;
    const x = new Float64Array(n);
    let k = 0;
    s.solve(
      f,
      0,
      new Array<number>(nState).fill(0),
      (n - 1) / fs,
      s.grid(1 / fs, (_t, y) => {
        if (k < n) x[k++] = y[1];
      }),
    );
    return x;
  };
  const ref = solve(1e-11);
  const pOut = new Float64Array(n);
  const ours = best(5, () => {
    const sim = new WooferSim(p);
    const x = new Float64Array(n);
    sim.processBlock(drive, n, pOut, x);
    return x;
  });
  const err = (a: Float64Array) => {
    let e = 0,
      s2 = 0;
    for (let k = 0; k < n; k++) {
      e += (a[k] - ref[k]) ** 2;
      s2 += ref[k] ** 2;
    }
    return Math.sqrt(e / s2);
  };
  const ourErr = err(ours.value);
  let peak = 0;
  for (const x of ref) peak = Math.max(peak, Math.abs(x));
  // The loosest odex tolerance that is at least as accurate as the fixed-step model.
  let odexMs = 0,
    odexErr = 0;
  for (let tol = 1e-2; tol >= 1e-11; tol /= 1.5) {
    const r = best(1, () => solve(tol));
    odexErr = err(r.value);
    odexMs = r.ms;
    if (odexErr <= ourErr) break;
  }
  return [
    {
      name: `odex / renderer model at equal accuracy (${(peak * 1000).toFixed(1)} mm peak; error ${ourErr.toExponential(1)} vs ${odexErr.toExponential(1)})`,
      value: Number((odexMs / ours.ms).toFixed(1)),
      unit: 'time ratio',
      target: '>= 50',
    },
  ];
}

/**
 * The engine's nonlinear render per lane sample (one channel, one frame: every stage of the way
 * chain, the stress meters, the guard) as a multiple of one biquad section per sample, both timed
 * here on the demo track. The render is given its drive, so no calibration pass is counted.
 */
function perSampleVsBiquad(): BenchResult[] {
  const sys = exampleSystem('vented');
  const fs = 48000;
  const track = synthesizeDemoTrack(fs);
  const frames = track.channels[0].length;
  const lanes = frames * track.channels.length;
  const opt = { voltsFs: 10, leqPerVoltDb: 0, analysisOnly: true };
  const renderMs = cpuBest(3, () => renderBuffer(sys, track.channels, fs, opt));
  const buf = Float64Array.from(track.channels[0]);
  const one = new BiquadCascade(Float64Array.of(0.2, 0.4, 0.2, -0.6, 0.2));
  const biquadMs = cpuBest(5, () => one.processInPlace(buf));
  const renderNs = (renderMs * 1e6) / lanes,
    biquadNs = (biquadMs * 1e6) / frames;
  return [
    {
      name: 'nonlinear render (vented, demo track), per channel and frame, CPU time',
      value: Number(renderNs.toFixed(1)),
      unit: 'ns',
      target: '',
    },
    { name: '  one biquad section, per sample', value: Number(biquadNs.toFixed(2)), unit: 'ns', target: '' },
    { name: '  render / biquad', value: Number((renderNs / biquadNs).toFixed(1)), unit: 'biquads', target: 'as low as it goes (report)' },
  ];
}

/**
 * A render with the driver models at the rate each way's filter allows, against the same render
 * with every model at the audio rate, interleaved (best of 3 each, after one warm-up), with the
 * per-frame figures and the biquad yardstick of the same run. Timed in CPU time of this process
 * (process.cpuUsage), which a machine shared with other work disturbs less than wall time. The
 * demo designs' woofers (crossed at 2.2 kHz) only allow 1/2, which does not pay
 * (model-rate.ts MIN_RATE_FACTOR): they run at the audio rate either way.
 */
function lowRateModels(): BenchResult[] {
  const fs = 48000;
  const track = synthesizeDemoTrack(fs);
  const frames = track.channels[0].length;
  const lanes = frames * track.channels.length;
  const doc = (name: string) => JSON.parse(readFileSync(join(HERE, '..', '..', 'public', 'examples', `${name}.json`), 'utf8'));
  const woofer = doc('living-room-vented');
  woofer.crossover = { type: 'lr4', fx_hz: 300 };
  const sub = doc('garage-subwoofer-bandpass');
  // Both channels, one lane each (the example plays its subwoofer from their mean).
  sub.listening.channels = 'pair';
  const systems: [string, SpeakerSystem][] = [
    ['woofer crossed at 300 Hz (vented)', parseOrThrow(woofer)],
    ['subwoofer (bandpass, LR4 at 90 Hz)', parseOrThrow(sub)],
  ];
  const rows: BenchResult[] = [];
  const buf = Float64Array.from(track.channels[0]);
  const one = new BiquadCascade(Float64Array.of(0.2, 0.4, 0.2, -0.6, 0.2));
  one.processInPlace(buf);
  let biquadMs = Infinity;
  for (let k = 0; k < 5; k++) {
    const c0 = process.cpuUsage();
    one.processInPlace(buf);
    const c = process.cpuUsage(c0);
    biquadMs = Math.min(biquadMs, (c.user + c.system) / 1000);
  }
  const biquadNs = (biquadMs * 1e6) / frames;
  for (const [name, sys] of systems) {
    const ms = { audio: Infinity, reduced: Infinity };
    for (let k = 0; k < 4; k++)
      for (const rate of ['audio', 'reduced'] as const) {
        const c0 = process.cpuUsage();
        renderBuffer(sys, track.channels, fs, { voltsFs: 10, leqPerVoltDb: 0, analysisOnly: true, driverRate: rate });
        const c = process.cpuUsage(c0);
        if (k > 0) ms[rate] = Math.min(ms[rate], (c.user + c.system) / 1000);
      }
    const ns = (r: 'audio' | 'reduced') => (ms[r] * 1e6) / lanes;
    rows.push(
      {
        name: `${name}: models at 1/8 / at the audio rate`,
        value: Number((ms.reduced / ms.audio).toFixed(3)),
        unit: 'time ratio',
        target: '< 1',
      },
      {
        name: '  per channel and frame, at 1/8 / at the audio rate',
        value: Number(ns('reduced').toFixed(1)),
        unit: 'ns',
        target: `(${ns('audio').toFixed(1)} ns)`,
      },
      {
        name: '  at 1/8, as biquad sections',
        value: Number((ns('reduced') / biquadNs).toFixed(1)),
        unit: 'biquads',
        target: `(${(ns('audio') / biquadNs).toFixed(1)} at the audio rate)`,
      },
    );
  }
  return rows;
}

/**
 * A render after the previous render's objects were collected (four full collections between
 * renders) against renders back to back, CPU time, best of 5 each in turns after two warm-ups
 * (best of 3 read 1.22 once on 4 December among runs of 0.96-1.0: one slow spell of the machine). V8 gives a
 * class's objects a shape that compiled code is specialised to and drops the shape with the last
 * object: without engine/keep-shape.ts every compiled loop was thrown away between such renders and
 * compiled again (this ratio read 1.13-1.38 before it, 0.99-1.15 with it; four runs each, 3 December
 * 2026; the renderer's and the way chains' classes keep theirs too since).
 */
function afterCollection(): BenchResult[] {
  setFlagsFromString('--expose-gc');
  const gc = runInNewContext('gc') as () => void;
  const sys = exampleSystem('vented');
  const fs = 48000;
  const track = synthesizeDemoTrack(fs);
  const lanes = track.channels[0].length * track.channels.length;
  const opt = { voltsFs: 10, leqPerVoltDb: 0, analysisOnly: true };
  const render = () => renderBuffer(sys, track.channels, fs, opt);
  const cpu = (collect: boolean) => {
    if (collect) for (let k = 0; k < 4; k++) gc();
    const c0 = process.cpuUsage();
    render();
    const c = process.cpuUsage(c0);
    return (c.user + c.system) / 1000;
  };
  render();
  render();
  let together = Infinity,
    apart = Infinity;
  for (let k = 0; k < 5; k++) {
    together = Math.min(together, cpu(false));
    apart = Math.min(apart, cpu(true));
  }
  return [
    {
      name: 'render after the last one was collected / back to back (vented, demo track), CPU time',
      value: Number((apart / together).toFixed(2)),
      unit: 'time ratio',
      target: '<= 1.1',
    },
    {
      name: '  after collection, per channel and frame',
      value: Number(((apart * 1e6) / lanes).toFixed(1)),
      unit: 'ns',
      target: `(${((together * 1e6) / lanes).toFixed(1)} ns back to back)`,
    },
  ];
}

function parseOrThrow(doc: unknown): SpeakerSystem {
  const r = parseDesign(doc);
  if (!r.ok) throw new Error(r.errors.map((e) => `${e.path}: ${e.message}`).join('; '));
  return r.system;
}

function memory(): BenchResult {
  const r = spawnSync(process.execPath, ['--import', 'tsx', join(HERE, 'render-memory-child.ts')], {
    encoding: 'utf8',
    cwd: join(HERE, '..', '..'),
  });
  if (r.status !== 0) throw new Error(`memory child failed: ${r.stderr}`);
  const j = JSON.parse(r.stdout.trim().split('\n').at(-1)!);
  return { name: '10-minute stereo render: peak memory / decoded audio', value: Number(j.ratio.toFixed(2)), unit: 'ratio', target: '<= 3' };
}

/** One part's rows, or one row saying why it failed (the other parts still report). */
async function part(name: string, run: () => BenchResult[] | Promise<BenchResult[]>): Promise<BenchResult[]> {
  try {
    return await run();
  } catch (e) {
    return [{ name: `${name} failed: ${(e as Error).message.split('\n')[0]}`, value: Number.NaN, unit: '', target: '' }];
  }
}

export async function bench(): Promise<BenchResult[]> {
  return [
    ...(await part('realtime', () => [realtime()])),
    ...(await part('two threads', twoThreads)),
    ...(await part('per sample', perSampleVsBiquad)),
    ...(await part('after collection', afterCollection)),
    ...(await part('low-rate models', lowRateModels)),
    ...(await part('linear chain', linearVsWebAudio)),
    ...(await part('odex', versusOdex)),
    ...(await part('memory', () => [memory()])),
  ];
}
