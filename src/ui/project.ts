// A project: any number of named variants of one job (each a design document; its name is the
// design's own), two of them compared at a time in slots A and B, and optionally one planned level
// shared by all of them. A project file holds the whole project; every variant in it passes the
// same validation as a design file (parseDesign, which migrates version 1), and a lone design or an
// A/B pair kept by an earlier version of the app opens as a project without losing anything.
import type { DesignDoc, PlannedLevelDoc } from '../engine/design/document.ts';
import { parseDesign } from '../engine/design/validate.ts';
import type { Issue } from '../engine/issues.ts';

export type Slot = 'a' | 'b';

export interface Variant {
  /** Stable within its project (slots and the shown way refer to it); never shown. */
  id: string;
  design: DesignDoc;
}

export interface Project {
  name: string;
  variants: Variant[];
  /** The variants compared in slots A and B (the same one in both when the project has only one). */
  compared: Record<Slot, string>;
  /** One planned level for every variant: an edit of one variant's level reaches all of them. */
  sharedLevel: boolean;
}

/** The pair on comparison, as screens read it: the compared variants' designs themselves. */
export interface Designs {
  a: DesignDoc;
  b: DesignDoc;
}

/** More variants than anyone compares; keeps a damaged or hostile file from growing without end. */
export const MAX_VARIANTS = 64;
/** The Listening bench switches among up to this many variants at once. */
export const MAX_BENCH_VARIANTS = 4;

export const PROJECT_FILE_KIND = 'preheard-project';
export const PROJECT_FILE_VERSION = 1;

export interface ProjectFile {
  format: typeof PROJECT_FILE_KIND;
  version: typeof PROJECT_FILE_VERSION;
  name: string;
  variants: Variant[];
  compared: Record<Slot, string>;
  shared_level: boolean;
}

export function variantOf(project: Project, slot: Slot): Variant {
  return project.variants.find((v) => v.id === project.compared[slot]) ?? project.variants[0];
}

export function pairOf(project: Project): Designs {
  return { a: variantOf(project, 'a').design, b: variantOf(project, 'b').design };
}

/** A project of two designs compared as A and B (the demo, an old stored pair, a share link). */
export function projectFromPair(pair: Designs, name = 'My project'): Project {
  return {
    name,
    variants: [
      { id: 'v1', design: pair.a },
      { id: 'v2', design: pair.b },
    ],
    compared: { a: 'v1', b: 'v2' },
    sharedLevel: false,
  };
}

/** An id not yet used in the project. */
export function freshId(project: Project): string {
  let n = project.variants.length + 1;
  const used = new Set(project.variants.map((v) => v.id));
  while (used.has(`v${n}`)) n++;
  return `v${n}`;
}

/** A name not yet used by a variant: "Vented 30 l", then "Vented 30 l (2)", "(3)"... */
export function freshName(project: Project, base: string): string {
  const names = new Set(project.variants.map((v) => v.design.name));
  const stem = base.replace(/ \(\d+\)$/, '') || 'Variant';
  if (!names.has(stem)) return stem;
  let n = 2;
  while (names.has(`${stem} (${n})`)) n++;
  return `${stem} (${n})`;
}

function withVariants(project: Project, variants: Variant[]): Project {
  const ids = new Set(variants.map((v) => v.id));
  const keep = (s: Slot) =>
    ids.has(project.compared[s]) ? project.compared[s] : variants[Math.min(s === 'a' ? 0 : 1, variants.length - 1)].id;
  return { ...project, variants, compared: { a: keep('a'), b: keep('b') } };
}

/** Adds a design as a new variant (named apart from the others) and compares it in `slot`. */
export function addVariant(project: Project, design: DesignDoc, slot: Slot | null): Project {
  if (project.variants.length >= MAX_VARIANTS) return project;
  const id = freshId(project);
  const named = { ...design, name: freshName(project, design.name) };
  const levelled = project.sharedLevel ? withLevel(named, variantOf(project, 'a').design.listening.level) : named;
  const next = withVariants(project, [...project.variants, { id, design: levelled }]);
  return slot ? { ...next, compared: { ...next.compared, [slot]: id } } : next;
}

/** A copy of a variant, placed after it. */
export function duplicateVariant(project: Project, id: string): Project {
  const from = project.variants.find((v) => v.id === id);
  if (!from || project.variants.length >= MAX_VARIANTS) return project;
  const copy: Variant = { id: freshId(project), design: { ...structuredClone(from.design), name: freshName(project, from.design.name) } };
  const at = project.variants.indexOf(from) + 1;
  return withVariants(project, [...project.variants.slice(0, at), copy, ...project.variants.slice(at)]);
}

/** Removes a variant (never the last one); a slot that compared it takes another. */
export function removeVariant(project: Project, id: string): Project {
  if (project.variants.length <= 1) return project;
  return withVariants(
    project,
    project.variants.filter((v) => v.id !== id),
  );
}

export function replaceVariant(project: Project, id: string, design: DesignDoc): Project {
  return { ...project, variants: project.variants.map((v) => (v.id === id ? { ...v, design } : v)) };
}

export function compare(project: Project, slot: Slot, id: string): Project {
  if (!project.variants.some((v) => v.id === id)) return project;
  return { ...project, compared: { ...project.compared, [slot]: id } };
}

export function swapCompared(project: Project): Project {
  return { ...project, compared: { a: project.compared.b, b: project.compared.a } };
}

function withLevel(design: DesignDoc, level: PlannedLevelDoc | undefined): DesignDoc {
  const listening = { ...design.listening };
  if (level === undefined) delete listening.level;
  else listening.level = structuredClone(level);
  return { ...design, listening };
}

/** Gives every variant `level` (the planned level of the variant it came from). */
export function shareLevel(project: Project, level: PlannedLevelDoc | undefined): Project {
  return { ...project, variants: project.variants.map((v) => ({ ...v, design: withLevel(v.design, level) })) };
}

export function projectFileText(project: Project): string {
  const file: ProjectFile = {
    format: PROJECT_FILE_KIND,
    version: PROJECT_FILE_VERSION,
    name: project.name,
    variants: project.variants,
    compared: project.compared,
    shared_level: project.sharedLevel,
  };
  return JSON.stringify(file, null, 2) + '\n';
}

export type ProjectRead =
  | { ok: true; project: Project; warnings: Issue[]; kind: 'project' | 'design' | 'pair' }
  | { ok: false; errors: Issue[]; warnings: Issue[] };

const problem = (path: string, message: string): Issue => ({ path, message, severity: 'error' });

/** Issues of a variant, their paths prefixed with where it sits and messages with its name. */
function variantIssues(issues: Issue[], index: number, name: unknown): Issue[] {
  const label = typeof name === 'string' && name ? `variant ${index + 1} (“${name}”)` : `variant ${index + 1}`;
  return issues.map((i) => ({ ...i, path: `variants.${index}.${i.path}`.replace(/\.$/, ''), message: `${label}: ${i.message}` }));
}

const isRecord = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === 'object' && !Array.isArray(v);

/**
 * Reads a project file, a lone design file (any version) or an A/B pair: all or nothing, every
 * variant through parseDesign. The designs come back as parseDesign gives them.
 */
export function readProject(raw: unknown): ProjectRead {
  if (!isRecord(raw))
    return { ok: false, errors: [problem('', 'the file holds no project or design (expected a JSON object)')], warnings: [] };
  if (raw.format === PROJECT_FILE_KIND) return readProjectFile(raw);
  if ('a' in raw && 'b' in raw && !('format' in raw)) {
    const a = parseDesign(raw.a);
    const b = parseDesign(raw.b);
    const warnings = [
      ...variantIssues(a.warnings, 0, a.ok ? a.design.name : undefined),
      ...variantIssues(b.warnings, 1, b.ok ? b.design.name : undefined),
    ];
    if (!a.ok || !b.ok)
      return {
        ok: false,
        errors: [...(a.ok ? [] : variantIssues(a.errors, 0, undefined)), ...(b.ok ? [] : variantIssues(b.errors, 1, undefined))],
        warnings,
      };
    return { ok: true, project: projectFromPair({ a: a.design, b: b.design }), warnings, kind: 'pair' };
  }
  const d = parseDesign(raw);
  if (!d.ok) return { ok: false, errors: d.errors, warnings: d.warnings };
  const project: Project = {
    name: d.design.name || 'My project',
    variants: [{ id: 'v1', design: d.design }],
    compared: { a: 'v1', b: 'v1' },
    sharedLevel: false,
  };
  return { ok: true, project, warnings: d.warnings, kind: 'design' };
}

/** A project as kept in memory or storage, checked as strictly as a project file. */
export function checkProject(raw: unknown): ProjectRead {
  if (!isRecord(raw)) return { ok: false, errors: [problem('', 'no project')], warnings: [] };
  return readProjectFile({
    format: PROJECT_FILE_KIND,
    version: PROJECT_FILE_VERSION,
    name: raw.name,
    variants: raw.variants,
    compared: raw.compared,
    shared_level: raw.sharedLevel,
  });
}

function readProjectFile(raw: Record<string, unknown>): ProjectRead {
  const errors: Issue[] = [];
  const warnings: Issue[] = [];
  if (raw.version !== PROJECT_FILE_VERSION)
    errors.push(
      problem('version', `this project file is version ${JSON.stringify(raw.version)}; this app reads version ${PROJECT_FILE_VERSION}`),
    );
  if (typeof raw.name !== 'string' || raw.name.length > 200)
    errors.push(problem('name', 'the project name must be text of at most 200 characters'));
  const list = raw.variants;
  if (!Array.isArray(list) || list.length === 0) errors.push(problem('variants', 'a project needs at least one variant'));
  else if (list.length > MAX_VARIANTS)
    errors.push(problem('variants', `a project holds at most ${MAX_VARIANTS} variants; this one has ${list.length}`));
  if (errors.length) return { ok: false, errors, warnings };
  const variants: Variant[] = [];
  const ids = new Set<string>();
  (list as unknown[]).forEach((item, i) => {
    if (!isRecord(item) || typeof item.id !== 'string' || !/^[\w-]{1,40}$/.test(item.id) || ids.has(item.id)) {
      errors.push(problem(`variants.${i}.id`, `variant ${i + 1} needs its own id (letters, digits, - or _)`));
      return;
    }
    ids.add(item.id);
    const r = parseDesign(item.design);
    warnings.push(...variantIssues(r.warnings, i, r.ok ? r.design.name : undefined));
    if (r.ok) variants.push({ id: item.id, design: r.design });
    else errors.push(...variantIssues(r.errors, i, isRecord(item.design) ? item.design.name : undefined));
  });
  const compared = isRecord(raw.compared) ? raw.compared : {};
  for (const s of ['a', 'b'] as const)
    if (typeof compared[s] !== 'string' || !ids.has(compared[s] as string))
      errors.push(problem(`compared.${s}`, `the variant compared as ${s.toUpperCase()} is not one of the project's variants`));
  if (raw.shared_level !== undefined && typeof raw.shared_level !== 'boolean')
    errors.push(problem('shared_level', 'shared_level must be true or false'));
  if (errors.length) return { ok: false, errors, warnings };
  return {
    ok: true,
    project: {
      name: raw.name as string,
      variants,
      compared: { a: compared.a as string, b: compared.b as string },
      sharedLevel: raw.shared_level === true,
    },
    warnings,
    kind: 'project',
  };
}
