// The one store: designs A and B plus settings. Components read state and dispatch intents;
// derived values (validation, analysis) are computed from it, never stored beside it.
import type { DesignDoc } from '../engine/design/document.ts';
import { getAt, setAt } from './paths.ts';

export type Slot = 'a' | 'b';
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
}

export interface Designs {
  a: DesignDoc;
  b: DesignDoc;
}

export interface AppState {
  designs: Designs;
  settings: Settings;
}

export const DEFAULT_SETTINGS: Settings = { screen: 'driver', theme: 'auto', cautionsDismissed: false };

export type Intent =
  | { type: 'edit'; slot: Slot; path: string; value: unknown }
  | { type: 'replace'; slot: Slot; design: DesignDoc; reason: string }
  | { type: 'replace-pair'; designs: Designs; reason: string }
  | { type: 'copy-a-to-b' }
  | { type: 'swap' }
  | { type: 'reset-demo' }
  | { type: 'undo' }
  | { type: 'redo' }
  | { type: 'settings'; patch: Partial<Settings> }
  /** Restores a saved state on start: not an undoable edit. */
  | { type: 'restore'; state: AppState };

interface HistoryEntry {
  designs: Designs;
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
    this.state = initial ?? { designs: demo(), settings: { ...DEFAULT_SETTINGS } };
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

  private commitDesigns(designs: Designs, label: string, coalesceKey: string | null): AppState {
    const t = this.now();
    const coalesce =
      coalesceKey !== null && this.lastEdit !== null && this.lastEdit.key === coalesceKey && t - this.lastEdit.at < COALESCE_MS;
    if (!coalesce) {
      this.past.push({ designs: this.state.designs, label });
      if (this.past.length > HISTORY_LIMIT) this.past.shift();
    }
    this.future = [];
    this.lastEdit = coalesceKey === null ? null : { key: coalesceKey, at: t };
    return { ...this.state, designs };
  }

  private reduce(intent: Intent): AppState {
    const { designs } = this.state;
    switch (intent.type) {
      case 'edit': {
        const current = designs[intent.slot];
        if (Object.is(getAt(current, intent.path), intent.value)) return this.state;
        const edited = setAt(current, intent.path, intent.value);
        return this.commitDesigns(
          { ...designs, [intent.slot]: edited },
          `edit ${intent.slot.toUpperCase()} ${intent.path}`,
          `${intent.slot}:${intent.path}`,
        );
      }
      case 'replace':
        return this.commitDesigns({ ...designs, [intent.slot]: intent.design }, intent.reason, null);
      case 'replace-pair':
        return this.commitDesigns(intent.designs, intent.reason, null);
      case 'copy-a-to-b':
        return this.commitDesigns({ a: designs.a, b: structuredClone(designs.a) }, 'copy A to B', null);
      case 'swap':
        return this.commitDesigns({ a: designs.b, b: designs.a }, 'swap A and B', null);
      case 'reset-demo':
        return this.commitDesigns(this.demo(), 'reset to the demo pair', null);
      case 'undo': {
        const prev = this.past.pop();
        if (!prev) return this.state;
        this.future.push({ designs: this.state.designs, label: prev.label });
        this.lastEdit = null;
        return { ...this.state, designs: prev.designs };
      }
      case 'redo': {
        const next = this.future.pop();
        if (!next) return this.state;
        this.past.push({ designs: this.state.designs, label: next.label });
        this.lastEdit = null;
        return { ...this.state, designs: next.designs };
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
