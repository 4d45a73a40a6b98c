// A share link opens in the tab that opened it, as a look: storage and the other tabs are untouched
// until the user keeps the shared designs. Keeping adds them to the saved project as new variants
// (nothing the user had is replaced); going back re-reads the saved project (another tab may have
// changed it meanwhile) and shows it again.
import type { Autosave } from './persist.ts';
import { addVariant, type Project } from './project.ts';
import type { Store } from './store.ts';

export class SharedView {
  /** The project on show before the first shared link was opened. */
  private before: Project | null = null;

  constructor(
    private readonly store: Store,
    private readonly autosave: Autosave,
  ) {}

  get active(): boolean {
    return this.autosave.held;
  }

  open(shared: Project): void {
    if (!this.autosave.held) this.before = this.store.get().project;
    this.autosave.hold();
    this.store.dispatch({ type: 'replace-project', project: shared, reason: 'open a shared link' });
  }

  /** The user keeps the shared designs: they join the saved project, are saved, and reach the other tabs. */
  async keep(): Promise<void> {
    const shared = this.store.get().project;
    const saved = this.autosave.hasRead ? await this.autosave.load() : undefined;
    const base = saved?.project ?? this.before;
    this.before = null;
    if (base) {
      let merged = base;
      const slotOf = (id: string) => (shared.compared.a === id ? 'a' : shared.compared.b === id ? 'b' : null);
      for (const v of shared.variants) merged = addVariant(merged, v.design, slotOf(v.id));
      this.store.dispatch({ type: 'replace-project', project: merged, reason: 'keep the shared designs' });
    }
    this.autosave.release(true);
  }

  /** Back to the saved project, as stored now. */
  async leave(): Promise<void> {
    const saved = this.autosave.hasRead ? await this.autosave.load() : undefined;
    const project = saved?.project ?? this.before;
    this.before = null;
    this.autosave.release(false);
    if (project) this.store.dispatch({ type: 'replace-project', project, reason: 'back to your saved designs' });
  }
}
