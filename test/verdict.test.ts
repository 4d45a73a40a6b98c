import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parseDesign } from '../src/engine/design/validate.ts';
import { analyze } from '../src/engine/response/analyze.ts';
import { verdict, clock } from '../src/engine/verdict/verdict.ts';
import { twoWayFrom } from './helpers/tweeter.ts';

const load = (name: string) => {
  const r = parseDesign(readFileSync(`public/examples/${name}.json`, 'utf8'));
  if (!r.ok) throw new Error(name);
  return analyze(r.system);
};

describe('plain-language verdict', () => {
  const a = load('living-room-sealed');
  const b = load('living-room-vented');

  it('states f3 and the -6/-10 dB points with the computed numbers, and which goes deeper', () => {
    const line = verdict(a, b).find((l) => l.id === 'extension')!.text;
    expect(line).toContain(`${a.figures.f3Hz.toFixed(1)} Hz`);
    expect(line).toContain(`${b.figures.f10Hz.toFixed(1)} Hz`);
    expect(line).toMatch(/B reaches deeper/);
  });

  it('gives headroom only when a search ran, in the published-style sentence', () => {
    expect(verdict(a, b).some((l) => l.id === 'headroom')).toBe(false);
    const lines = verdict(
      a,
      b,
      ['A', 'B'],
      [
        { cleanSplDb: 88, cleanVolts: 9, firstLimit: 'excursion', firstLimitS: 42.3 },
        { cleanSplDb: 91.5, cleanVolts: 12, firstLimit: 'port-speed', firstLimitS: 17 },
      ],
    );
    expect(lines.find((l) => l.id === 'headroom')!.text).toBe(
      'B plays this track 3.5 dB louder cleanly than A (91.5 against 88.0 dB at the seat); A first runs out of cone travel (Xmax) at 0:42, B first runs out of port air speed at 0:17.',
    );
  });

  it('names the way that limits first when a design has more than one driver way', () => {
    const r = parseDesign(twoWayFrom('public/examples/living-room-vented.json'));
    if (!r.ok) throw new Error('two-way');
    const two = analyze(r.system);
    const text = verdict(
      a,
      two,
      ['A', 'B'],
      [
        { cleanSplDb: 88, cleanVolts: 9, firstLimit: 'excursion', firstLimitS: 42.3, firstLimitWay: 'woofer' },
        { cleanSplDb: 86, cleanVolts: 7, firstLimit: 'excursion', firstLimitS: 3.5, firstLimitWay: 'tweeter' },
      ],
    ).find((l) => l.id === 'headroom')!.text;
    // A has one driver way: no way named; B's tweeter is.
    expect(text).toContain('A first runs out of cone travel (Xmax) at 0:42');
    expect(text).toContain("B's tweeter first runs out of cone travel (Xmax) at 0:03");
  });

  it('speaks of port noise only for the design with a port', () => {
    const ports = verdict(a, b).filter((l) => l.id === 'port');
    expect(ports).toHaveLength(1);
    expect(ports[0].text).toMatch(/^B's port/);
  });

  it('formats track times as m:ss', () => {
    expect(clock(125.9)).toBe('2:05');
  });

  it('names each way of a multi-way design: its box, and its port if it has one', () => {
    const d = twoWayFrom('public/examples/living-room-vented.json');
    const two = parseDesign(d);
    if (!two.ok) throw new Error(two.errors.map((e) => e.message).join());
    const lines = verdict(a, analyze(two.system));
    expect(lines.find((l) => l.id === 'size')!.text).toBe('Box: A sealed 14.0 l, B woofer vented 20.0 l and tweeter sealed 0.03 l.');
    const ports = lines.filter((l) => l.id === 'port');
    expect(ports).toHaveLength(1);
    expect(ports[0].text).toMatch(/^B's woofer's port/);
  });
});
