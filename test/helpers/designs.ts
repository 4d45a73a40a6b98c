// Building designs for tests: a driver from T/S values and a box, with everything else neutral.
import { parseDesign } from '../../src/engine/design/validate.ts';
import type { BoxDoc, DesignDoc, DriverDoc } from '../../src/engine/design/document.ts';
import type { DriverWay, SpeakerSystem } from '../../src/engine/system.ts';

export const AIR_20C = { temperature_c: 20, pressure_kpa: 101.325 };

/** A first-version document (one woofer, a crossover to a flat upper band): read through the migration. */
export interface V1Doc {
  format: 'preheard-design';
  version: 1;
  name: string;
  notes?: string;
  driver: DriverDoc;
  box: BoxDoc;
  amplifier: DesignDoc['amplifier'];
  crossover: { type: 'lr2' | 'lr4' | 'lr8' | 'none'; fx_hz?: number; highpass_hz?: number };
  listening: DesignDoc['listening'];
  air?: DesignDoc['air'];
}

export function doc(driver: Partial<DriverDoc>, box: BoxDoc, extra: Partial<V1Doc> = {}): V1Doc {
  return {
    format: 'preheard-design',
    version: 1,
    name: 'test',
    driver: { re_ohm: 6, le_mh: 0, sd_cm2: 130, xmax_mm: 5, xlim_mm: 10, pe_w: 50, ...driver } as DriverDoc,
    box,
    amplifier: { power_w: 100, load_ohm: 8, rs_ohm: 0 },
    crossover: { type: 'lr4', fx_hz: 2000 },
    listening: { distance_m: 1, space: 'half' },
    air: AIR_20C,
    ...extra,
  };
}

/** The first driver way of a system (the woofer of a first-version design). */
export const woofer = (sys: SpeakerSystem): DriverWay => sys.ways.find((w) => w.kind === 'driver') as DriverWay;

export function system(d: DesignDoc | V1Doc): SpeakerSystem {
  const r = parseDesign(d);
  if (!r.ok) throw new Error(r.errors.map((e) => `${e.path}: ${e.message}`).join('\n'));
  return r.system;
}

/** Qes that gives total Q `qts` with the given Qms. */
export const qesFor = (qts: number, qms: number): number => 1 / (1 / qts - 1 / qms);
