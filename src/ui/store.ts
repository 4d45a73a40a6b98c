// The one store: the project (its variants, the two compared as A and B) plus settings. Components
// read state and dispatch intents; derived values (validation, analysis) are computed from it, never
// stored beside it. `designs` is the compared pair itself (the same objects as in the project),
// rebuilt by `stateOf` whenever the project changes, so screens read A and B as before.
import type { DesignDoc } from '../engine/design/document.ts';
import type { UnitSystem } from './units.ts';
import { getAt, setAt } from './paths.ts';
import {
  addVariant,
  compare,
  duplicateVariant,
  pairOf,
  projectFromPair,
  removeVariant,
  replaceVariant,
  shareLevel,
  swapCompared,
  variantOf,
  type Designs,
  type Project,
  type Slot,
} from './project.ts';

export type { Designs, Slot };
export const SLOTS: readonly Slot[] = ['a', 'b'];
export const SLOT_LABEL: Record<Slot, string> = { a: 'A', b: 'B' };

/** Screens of the one page. Later issues add the listening, stress, trial, probe and client screens. */
export type ScreenId =
  | 'driver'
  | 'cabinet'
  | 'drive'
  | 'curves'
  | 'bench'
  | 'stress'
  // Deciding by ear and showing the client.
  | 'trial'
  | 'headroom'
  | 'sheet'
  | 'present';

export interface Settings {
  screen: ScreenId;
  theme: 'auto' | 'light' | 'dark';
  /** The first-run cautions were read and dismissed. */
  cautionsDismissed: boolean;
  /** Client sheet: the designer's own title and notes, saved with the designs. */
  sheetTitle?: string;
  sheetNotes?: string;
  /** Blind trial: rounds per trial. */
  trialRounds?: number;
  /** Listening bench choices kept across visits (the monitor gain is not: it starts low every time). */
  bench?: { match: boolean; mode: 'nonlinear' | 'linear' | 'residual' };
  /** The way each design's Driver sheet and Cabinet show (an index into its ways). */
  way?: Partial<Record<Slot, number>>;
  /** Curves: draw each way beside the system sum. */
  showWays?: boolean;
  /** Curves: the charts the user chose not to see (chart ids; unknown ids are ignored). */
  curvesHidden?: string[];
  /** Display units (units.ts): metric unless set; design files stay SI-named either way. */
  units?: UnitSystem;
}

export interface AppState {
  project: Project;
  /** The compared pair: always `pairOf(project)`, never set on its own. */
  designs: Designs;
  settings: Settings;
}

export function stateOf(project: Project, settings: Settings): AppState {
  return { project, designs: pairOf(project), settings };
}

export const DEFAULT_SETTINGS: Settings = { screen: 'driver', theme: 'auto', cautionsDismissed: false };

export type Intent =
  | { type: 'edit'; slot: Slot; path: string; value: unknown }
  | { type: 'replace'; slot: Slot; design: DesignDoc; reason: string }
  /** The compared pair replaced (a tab of an earlier version announced its A and B). */
  | { type: 'replace-pair'; designs: Designs; reason: string }
  | { type: 'replace-project'; project: Project; reason: string }
  | { type: 'copy-a-to-b' }
  | { type: 'swap' }
  | { type: 'reset-demo' }
  /** A new variant (named apart from the others), compared in `slot` when one is given. */
  | { type: 'add-variant'; design: DesignDoc; slot: Slot | null; reason: string }
  | { type: 'duplicate-variant'; id: string }
  | { type: 'remove-variant'; id: string }
  | { type: 'compare'; slot: Slot; id: string }
  | { type: 'rename-project'; name: string }
  | { type: 'rename-variant'; id: string; name: string }
  | { type: 'share-level'; shared: boolean }
  | { type: 'undo' }
  | { type: 'redo' }
  | { type: 'settings'; patch: Partial<Settings> }
  /** Restores a saved state on start: not an undoable edit. */
  | { type: 'restore'; state: AppState };

interface HistoryEntry {
  project: Project;
  label: string;
}

/** Typing into one field within this long counts as one undo step. */
const COALESCE_MS = 1200;
const HISTORY_LIMIT = 200;

export type Listener = (state: AppState, intent: Intent) => void;

export class Store {
  private state: AppState;
  private past: HistoryEntry[] = [];
  private future: HistoryEntry[] = [];
  private lastEdit: { key: string; at: number } | null = null;
  private listeners = new Set<Listener>();

  constructor(
    private readonly demo: () => Designs,
    initial?: AppState,
    private readonly now: () => number = () => Date.now(),
  ) {
    this.state = initial ?? stateOf(projectFromPair(demo()), { ...DEFAULT_SETTINGS });
  }

  get(): AppState {
    return this.state;
  }

  canUndo(): boolean {
    return this.past.length > 0;
  }
  canRedo(): boolean {
    return this.future.length > 0;
  }
  undoLabel(): string | null {
    return this.past.length ? this.past[this.past.length - 1].label : null;
  }
  redoLabel(): string | null {
    return this.future.length ? this.future[this.future.length - 1].label : null;
  }

  subscribe(fn: Listener): () => void {
    this.listeners.add(fn);
    return () => this.listeners.delete(fn);
  }

  dispatch(intent: Intent): void {
    const next = this.reduce(intent);
    if (next === this.state) return;
    this.state = next;
    for (const fn of this.listeners) fn(next, intent);
  }

  private commit(project: Project, label: string, coalesceKey: string | null): AppState {
    const t = this.now();
    const coalesce =
      coalesceKey !== null && this.lastEdit !== null && this.lastEdit.key === coalesceKey && t - this.lastEdit.at < COALESCE_MS;
    if (!coalesce) {
      this.past.push({ project: this.state.project, label });
      if (this.past.length > HISTORY_LIMIT) this.past.shift();
    }
    this.future = [];
    this.lastEdit = coalesceKey === null ? null : { key: coalesceKey, at: t };
    return stateOf(project, this.state.settings);
  }

  private reduce(intent: Intent): AppState {
    const { project } = this.state;
    switch (intent.type) {
      case 'edit': {
        const variant = variantOf(project, intent.slot);
        if (Object.is(getAt(variant.design, intent.path), intent.value)) return this.state;
        const edited = setAt(variant.design, intent.path, intent.value);
        let next = replaceVariant(project, variant.id, edited);
        // A shared planned level: the edit reaches every variant.
        if (project.sharedLevel && /^listening\.level(\.|$)/.test(intent.path)) next = shareLevel(next, edited.listening.level);
        return this.commit(next, `edit ${intent.slot.toUpperCase()} ${intent.path}`, `${variant.id}:${intent.path}`);
      }
      case 'replace':
        return this.commit(replaceVariant(project, variantOf(project, intent.slot).id, intent.design), intent.reason, null);
      case 'replace-pair': {
        const a = replaceVariant(project, variantOf(project, 'a').id, intent.designs.a);
        return this.commit(replaceVariant(a, variantOf(a, 'b').id, intent.designs.b), intent.reason, null);
      }
      case 'replace-project':
        return this.commit(intent.project, intent.reason, null);
      case 'copy-a-to-b': {
        const a = variantOf(project, 'a');
        const b = variantOf(project, 'b');
        if (a.id === b.id) return this.state;
        return this.commit(replaceVariant(project, b.id, { ...structuredClone(a.design), name: b.design.name }), 'copy A to B', null);
      }
      case 'swap':
        return this.commit(swapCompared(project), 'swap A and B', null);
      case 'reset-demo':
        return this.commit(projectFromPair(this.demo()), 'reset to the demo pair', null);
      case 'add-variant':
        return this.commit(addVariant(project, intent.design, intent.slot), intent.reason, null);
      case 'duplicate-variant':
        return this.commit(duplicateVariant(project, intent.id), 'duplicate a variant', null);
      case 'remove-variant':
        return this.commit(removeVariant(project, intent.id), 'remove a variant', null);
      case 'compare': {
        if (project.compared[intent.slot] === intent.id) return this.state;
        return this.commit(compare(project, intent.slot, intent.id), `compare another variant as ${intent.slot.toUpperCase()}`, null);
      }
      case 'rename-project':
        if (project.name === intent.name) return this.state;
        return this.commit({ ...project, name: intent.name }, 'rename the project', 'project-name');
      case 'rename-variant': {
        const v = project.variants.find((x) => x.id === intent.id);
        if (!v || v.design.name === intent.name) return this.state;
        return this.commit(replaceVariant(project, v.id, { ...v.design, name: intent.name }), 'rename a variant', `${v.id}:name`);
      }
      case 'share-level': {
        if (project.sharedLevel === intent.shared) return this.state;
        const next = { ...project, sharedLevel: intent.shared };
        return this.commit(
          intent.shared ? shareLevel(next, variantOf(project, 'a').design.listening.level) : next,
          intent.shared ? 'share one planned level' : 'plan each variant’s level apart',
          null,
        );
      }
      case 'undo': {
        const prev = this.past.pop();
        if (!prev) return this.state;
        this.future.push({ project: this.state.project, label: prev.label });
        this.lastEdit = null;
        return stateOf(prev.project, this.state.settings);
      }
      case 'redo': {
        const next = this.future.pop();
        if (!next) return this.state;
        this.past.push({ project: this.state.project, label: next.label });
        this.lastEdit = null;
        return stateOf(next.project, this.state.settings);
      }
      case 'settings': {
        const settings = { ...this.state.settings, ...intent.patch };
        return { ...this.state, settings };
      }
      case 'restore':
        this.past = [];
        this.future = [];
        this.lastEdit = null;
        return intent.state;
    }
  }
}
