// A share link opens in the tab that opened it, as a look: storage and the other tabs are untouched
// until the user keeps the shared designs. Going back re-reads the saved designs (another tab may
// have changed them meanwhile) and shows them again.
import type { Autosave } from './persist.ts';
import type { Designs, Store } from './store.ts';

export class SharedView {
  /** The designs on show before the first shared link was opened. */
  private before: Designs | null = null;

  constructor(
    private readonly store: Store,
    private readonly autosave: Autosave,
  ) {}

  get active(): boolean {
    return this.autosave.held;
  }

  open(designs: Designs): void {
    if (!this.autosave.held) this.before = this.store.get().designs;
    this.autosave.hold();
    this.store.dispatch({ type: 'replace-pair', designs, reason: 'open a shared link' });
  }

  /** The user keeps the shared designs: they are saved (and reach the other tabs). */
  keep(): void {
    this.before = null;
    this.autosave.release(true);
  }

  /** Back to the saved designs, as stored now. */
  async leave(): Promise<void> {
    const saved = this.autosave.hasRead ? await this.autosave.load() : undefined;
    const designs = saved?.designs ?? this.before;
    this.before = null;
    this.autosave.release(false);
    if (designs) this.store.dispatch({ type: 'replace-pair', designs, reason: 'back to your saved designs' });
  }
}
