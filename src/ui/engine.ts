// The UI's one door into the engine: validation, analysis and alignment suggestions, memoised so
// that an unchanged design is never re-analysed. Nothing here computes physics.
import { analyze, parseDesign, suggestAlignments } from '../engine/index.ts';
import type { Analysis } from '../engine/response/types.ts';
import type { DesignDoc } from '../engine/design/document.ts';
import type { AlignmentSuggestion } from '../engine/align/index.ts';
import { subsonicSuggestion, type SubsonicSuggestion } from '../engine/align/subsonic.ts';
import type { SpeakerSystem } from '../engine/system.ts';
import type { Issue } from '../engine/issues.ts';
import type { Slot } from './store.ts';
import { BOX_KINDS } from '../engine/box/index.ts';
import type { BoxFigure } from '../engine/box/physics.ts';
import type { DriverWay } from '../engine/system.ts';

export { PORT_SPEED_LIMIT, SENSITIVITY_VOLTS } from '../engine/units.ts';

export type ParseResult =
  | { ok: true; design: DesignDoc; system: SpeakerSystem; warnings: Issue[] }
  | { ok: false; errors: Issue[]; warnings: Issue[] };

export type Suggestion = AlignmentSuggestion;

export interface Derived {
  parse: ParseResult;
  /** Problems of the design as edited: errors first. */
  issues: Issue[];
  /** Analysis of the design as edited, or of its last valid version when the edit is rejected. */
  analysis: Analysis | null;
  /** The system that analysis belongs to (screens read the system here, not from the analysis). */
  system: SpeakerSystem | null;
  /** True when `analysis` belongs to an earlier, valid version (the current one has errors). */
  stale: boolean;
}

const parsed = new WeakMap<object, ParseResult>();
const analysed = new WeakMap<SpeakerSystem, Analysis>();
const suggested = new WeakMap<SpeakerSystem, Suggestion[]>();
const lastGood: Record<Slot, { analysis: Analysis; system: SpeakerSystem } | null> = { a: null, b: null };

export function validate(doc: unknown): ParseResult {
  if (doc !== null && typeof doc === 'object') {
    const hit = parsed.get(doc);
    if (hit) return hit;
    const r = parseDesign(doc) as ParseResult;
    parsed.set(doc, r);
    return r;
  }
  return parseDesign(doc) as ParseResult;
}

export function analysisOf(system: SpeakerSystem): Analysis {
  let a = analysed.get(system);
  if (!a) {
    a = analyze(system, {});
    analysed.set(system, a);
  }
  return a;
}

const subsonics = new WeakMap<Analysis, SubsonicSuggestion | null>();

/** The subsonic high-pass the design's first limit calls for, if any (engine align/subsonic.ts), once per analysis. */
export function subsonicFor(system: SpeakerSystem, analysis: Analysis): SubsonicSuggestion | null {
  let s = subsonics.get(analysis);
  if (s === undefined) {
    s = subsonicSuggestion(system, analysis);
    subsonics.set(analysis, s);
  }
  return s;
}

export function suggestionsFor(system: SpeakerSystem): Suggestion[] {
  let s = suggested.get(system);
  if (!s) {
    s = suggestAlignments(system);
    suggested.set(system, s);
  }
  return s;
}

export function derive(slot: Slot, doc: DesignDoc): Derived {
  const parse = validate(doc);
  if (parse.ok) {
    const analysis = analysisOf(parse.system);
    lastGood[slot] = { analysis, system: parse.system };
    return { parse, issues: [...parse.warnings, ...analysis.warnings], analysis, system: parse.system, stale: false };
  }
  const good = lastGood[slot];
  return {
    parse,
    issues: [...parse.errors, ...parse.warnings],
    analysis: good?.analysis ?? null,
    system: good?.system ?? null,
    stale: good !== null,
  };
}

/** A way's box figures as its kind gives them (tuning, port length, pipe resonance, chambers...). */
export function boxFigures(system: SpeakerSystem, way: DriverWay): BoxFigure[] {
  return BOX_KINDS[way.box.type].figures(way.box, system.air);
}
