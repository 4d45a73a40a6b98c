// Telling compared variants apart: shared name beginnings left out, and what differs in words.
import { describe, expect, it } from 'vitest';
import { demoPair } from '../src/ui/demo.ts';
import { designDifferences, differingPaths } from '../src/ui/pair-difference.ts';
import { distinctNames, sharedBeginning } from '../src/ui/pair-names.ts';
import { setAt } from '../src/ui/paths.ts';

describe('distinct names', () => {
  it('leaves out the shared beginning, cut after a separator', () => {
    const names = ['Living-room monitor, sealed 14 l', 'Living-room monitor, sealed 14 l (2)', 'Living-room monitor, vented 20 l'];
    expect(distinctNames(names)).toEqual(['sealed 14 l', 'sealed 14 l (2)', 'vented 20 l']);
    expect(sharedBeginning(names)).toBe('Living-room monitor');
  });

  it('never cuts inside a word or leaves a name empty', () => {
    expect(distinctNames(['Okafor shelf sealed', 'Okafor shelf vented'])).toEqual(['Okafor shelf sealed', 'Okafor shelf vented']);
    expect(distinctNames(['Client, woofer', 'Client, woofer, larger'])).toEqual(['woofer', 'woofer, larger']);
    expect(distinctNames(['A, b', 'A, '])).toEqual(['A, b', 'A,']);
    expect(distinctNames(['only one, name'])).toEqual(['only one, name']);
    expect(distinctNames(['Job – one', 'Job – two'])).toEqual(['one', 'two']);
  });
});

describe('design differences', () => {
  const { a, b } = demoPair();

  it('finds nothing between a design and its copy under another name', () => {
    expect(designDifferences(a, { ...a, name: 'another name', notes: 'other notes' })).toEqual([]);
    expect(differingPaths({ x: [1, { y: 2 }] }, { x: [1, { y: 3 }] })).toEqual(['x.1.y']);
  });

  it('names the parts of the box that differ, each once', () => {
    let c = setAt(a, 'ways.0.box.vb_l', 18);
    expect(designDifferences(a, c)).toEqual(['box volume']);
    c = setAt(c, 'listening.level', { mode: 'spl', spl_db: 90 });
    c = setAt(c, 'amplifier.power_w', 200);
    expect(designDifferences(a, c)).toEqual(['box volume', 'amplifier', 'planned level']);
  });

  it('tells the demo pair apart by its box type alone, and names a way after the first', () => {
    expect(designDifferences(a, b)).toEqual(['box type']);
    const c = setAt(a, 'ways.1.sensitivity_db', 80);
    expect(designDifferences(a, c)).toEqual([`${a.ways[1].name} level`]);
  });
});
