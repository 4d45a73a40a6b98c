// Designs whose whole analysis test/analysis-identity.test.ts pins bit for bit: every example (as
// shipped and with a smaller box), an active two-way, a passive radiator, a coil with semi-inductance
// and a baffle step, and a woofer with a measured response.
import { readdirSync, readFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { parseDesign } from '../../src/engine/design/validate.ts';
import type { DesignDoc } from '../../src/engine/design/document.ts';
import type { SpeakerSystem } from '../../src/engine/system.ts';
import { abs } from '../../src/engine/complex.ts';
import { bareModel, logSpaced, sealedDoc, withMeasured } from './measured.ts';
import { twoWayDoc } from './two-way.ts';
import { doc, qesFor, system } from './designs.ts';

function parsed(d: unknown): SpeakerSystem {
  const r = parseDesign(d);
  if (!r.ok) throw new Error(r.errors.map((e) => `${e.path}: ${e.message}`).join('; '));
  return r.system;
}

function smallerBox(d: DesignDoc): DesignDoc {
  const next = structuredClone(d);
  for (const way of next.ways) {
    if (way.kind !== 'driver') continue;
    const box = way.box as unknown as Record<string, unknown>;
    for (const k of ['vb_l', 'vb_rear_l', 'vb_front_l'])
      if (typeof box[k] === 'number') box[k] = Number(((box[k] as number) * 0.87).toFixed(3));
  }
  return next;
}

export function analysisCases(): { name: string; system: SpeakerSystem }[] {
  const out: { name: string; system: SpeakerSystem }[] = [];
  for (const file of readdirSync('public/examples')
    .filter((f) => f.endsWith('.json'))
    .sort()) {
    const first = parseDesign(readFileSync(`public/examples/${file}`, 'utf8'));
    if (!first.ok) throw new Error(`${file} does not parse`);
    out.push({ name: file, system: first.system });
    out.push({ name: `${file}, box 0.87x`, system: parsed(smallerBox(first.design)) });
  }
  out.push({ name: 'active two-way', system: parsed(twoWayDoc({ wooferOffsetMm: 30 })) });
  out.push({
    name: 'passive radiator',
    system: system(
      doc(
        { fs_hz: 35, qes: qesFor(0.35, 8), qms: 8, vas_l: 50, sd_cm2: 200, xmax_mm: 6, l2_mh: 0.8, r2_ohm: 4, le_mh: 0.3 },
        { type: 'passive-radiator', vb_l: 30, ql: null, radiator: { sd_cm2: 300, mmp_g: 60, cmp_mm_per_n: 0.5, qmp: 20, xmax_mm: 12 } },
        { listening: { distance_m: 2, space: 'half', baffle_width_cm: 25 } },
      ),
    ),
  });
  const sealed = sealedDoc();
  sealed.ways = sealed.ways.slice(0, 1);
  const model = bareModel(sealed);
  const shape = (f: number) => -4 * Math.exp(-((Math.log2(f / 900) / 0.5) ** 2));
  const table = ['Hz dB', ...logSpaced(20, 20000, 120).map((f) => `${f} ${20 * Math.log10(abs(model(f))) + shape(f)}`)].join('\n');
  out.push({ name: 'sealed woofer with a measured response', system: withMeasured(sealed, table, 300).system });
  return out;
}

/**
 * A hash of every number and string of an analysis, the design it was made from left out: each
 * number by its 64 bits, so any change in the last bit shows.
 */
export function analysisHash(value: unknown): string {
  const h = createHash('sha256');
  const bits = new Float64Array(1);
  const walk = (v: unknown, key: string) => {
    if (key === 'system') return;
    if (typeof v === 'number') {
      bits[0] = v;
      h.update(new Uint8Array(bits.buffer));
    } else if (typeof v === 'string' || typeof v === 'boolean') h.update(`${key}=${String(v)};`);
    else if (v === null || v === undefined) h.update(`${key}:${String(v)};`);
    else if (v instanceof Float64Array) h.update(new Uint8Array(v.buffer, v.byteOffset, v.byteLength));
    else if (Array.isArray(v)) {
      h.update(`[${v.length}`);
      for (const [i, x] of v.entries()) walk(x, String(i));
    } else if (typeof v === 'object') {
      for (const k of Object.keys(v as object).sort()) {
        h.update(`{${k}`);
        walk((v as Record<string, unknown>)[k], k);
      }
    }
  };
  walk(value, '');
  return h.digest('hex');
}
