// Reading a design: JSON text or value -> migrated -> schema-checked -> SI system -> plausibility.
// Every problem is reported at once with its field path; nothing is half-loaded.
import * as v from 'valibot';
import { DESIGN_FORMAT, DESIGN_VERSION, type DesignDoc } from './document.ts';
import { designSchema } from '../box/index.ts';
import { toSystem } from './convert.ts';
import { plausibility } from './checks.ts';
import { MAX_DESIGN_DEPTH, nestedDeeperThan } from './nesting.ts';
import { error, type Issue } from '../issues.ts';
import type { SpeakerSystem } from '../system.ts';

export type ParseResult =
  | { ok: true; design: DesignDoc; system: SpeakerSystem; warnings: Issue[] }
  | { ok: false; errors: Issue[]; warnings: Issue[] };

function pathOf(issue: v.BaseIssue<unknown>): string {
  let out = '';
  for (const item of issue.path ?? []) {
    const key = item.key as string | number;
    out += typeof key === 'number' ? `[${key}]` : out ? `.${key}` : String(key);
  }
  return out;
}

function shown(value: unknown): string {
  const text = JSON.stringify(value);
  return text === undefined ? String(value) : text.length > 60 ? `${text.slice(0, 57)}...` : text;
}

export function schemaIssue(issue: v.BaseIssue<unknown>): Issue {
  const path = pathOf(issue);
  if (issue.type === 'strict_object' && issue.expected === 'never') return error(path, 'is not a field of this design format');
  if (issue.input === undefined) return error(path, 'is required');
  return error(path, `${issue.message}, got ${shown(issue.input)}`);
}

/**
 * Version 1 -> 2: the one woofer becomes way "woofer" (the crossover low-pass and the subsonic
 * high-pass become its filter), and the first version's flat upper band becomes a flat way with
 * the complementary high-pass (inverted for LR2, as the first version summed it). Lossless: every
 * field is carried over, optional ones only when present.
 */
function migrateV1(d: Record<string, unknown>): Record<string, unknown> {
  const { crossover, driver, box, version: _v, ...rest } = d;
  const xo = (crossover ?? {}) as Record<string, unknown>;
  const type = xo.type;
  const split = type === 'lr2' || type === 'lr4' || type === 'lr8';
  const filter: Record<string, unknown> = { type: 'active' };
  if (split && xo.fx_hz !== undefined) filter.lowpass = { shape: type, hz: xo.fx_hz };
  if (typeof xo.highpass_hz === 'number' && xo.highpass_hz > 0) filter.highpass = { shape: 'bw2', hz: xo.highpass_hz };
  const ways: Record<string, unknown>[] = [{ kind: 'driver', name: 'woofer', driver, box, filter }];
  if (split && xo.fx_hz !== undefined) {
    ways.push({
      kind: 'flat',
      name: 'upper band',
      filter: { type: 'active', highpass: { shape: type, hz: xo.fx_hz } },
      ...(type === 'lr2' ? { polarity: -1 } : {}),
    });
  }
  const { format, name, notes, ...others } = rest;
  return { format, version: 2, name, ...(notes !== undefined ? { notes } : {}), ways, ...others };
}

/** Brings older document versions up to the current one; version 1 stays readable forever. */
export function migrate(raw: Record<string, unknown>): { doc: Record<string, unknown> } | { issue: Issue } {
  const version = raw.version;
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 1) {
    return { issue: error('version', `must be a whole number (this app writes ${DESIGN_VERSION}), got ${shown(version)}`) };
  }
  if (version > DESIGN_VERSION) {
    return { issue: error('version', `${version} is newer than this app understands (${DESIGN_VERSION}); update preheard`) };
  }
  if (version === 1) {
    if (typeof raw.crossover !== 'object' || raw.crossover === null || Array.isArray(raw.crossover)) {
      return { issue: error('crossover', 'is required in a version 1 design') };
    }
    const xo = raw.crossover as Record<string, unknown>;
    if (xo.type !== 'none' && xo.fx_hz === undefined) {
      return { issue: error('crossover.fx_hz', `is required for a ${String(xo.type)} crossover (20 to 5000 Hz)`) };
    }
    // The first version's rule for its subsonic filter, kept for its files.
    const hp = xo.highpass_hz,
      fx = xo.fx_hz;
    if (xo.type !== 'none' && typeof hp === 'number' && typeof fx === 'number' && hp > 0 && hp * 4 > fx) {
      return { issue: error('crossover.highpass_hz', `${hp} Hz must lie at least two octaves below the crossover at ${fx} Hz`) };
    }
    return { doc: migrateV1(raw) };
  }
  return { doc: raw };
}

export function parseDesign(input: unknown): ParseResult {
  let raw = input;
  if (typeof input === 'string') {
    try {
      raw = JSON.parse(input);
    } catch (e) {
      return { ok: false, errors: [error('', `not valid JSON: ${(e as Error).message}`)], warnings: [] };
    }
  }
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    return { ok: false, errors: [error('', 'a design must be a JSON object')], warnings: [] };
  }
  if (nestedDeeperThan(raw, MAX_DESIGN_DEPTH)) {
    return { ok: false, errors: [error('', `nests more than ${MAX_DESIGN_DEPTH} levels deep; a design needs 6`)], warnings: [] };
  }
  const obj = raw as Record<string, unknown>;
  if (obj.format !== DESIGN_FORMAT) {
    return {
      ok: false,
      errors: [error('format', `must be "${DESIGN_FORMAT}", got ${shown(obj.format)}: this is not a preheard design`)],
      warnings: [],
    };
  }
  const migrated = migrate(obj);
  if ('issue' in migrated) return { ok: false, errors: [migrated.issue], warnings: [] };
  const parsed = v.safeParse(designSchema, migrated.doc, { abortEarly: false });
  if (!parsed.success) return { ok: false, errors: parsed.issues.map(schemaIssue), warnings: [] };
  const design = parsed.output as DesignDoc;
  const built = toSystem(design);
  const issues = [...built.issues];
  if (built.system) issues.push(...plausibility(built.system));
  const errors = issues.filter((i) => i.severity === 'error');
  const warnings = issues.filter((i) => i.severity === 'warning');
  if (!built.system || errors.length > 0) return { ok: false, errors, warnings };
  return { ok: true, design, system: built.system, warnings };
}
