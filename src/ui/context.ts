import { createContext } from 'preact';
import { useContext } from 'preact/hooks';
import type { AppState, Intent, Slot, Store } from './store.ts';
import type { Derived } from './engine.ts';
import type { ConfirmQuestion } from './app/dialogs.tsx';

export interface AppView {
  state: AppState;
  derived: Record<Slot, Derived>;
  dispatch: (intent: Intent) => void;
  store: Store;
  /** Asks before a destructive step (the app's confirmation dialog); absent, the step goes ahead. */
  confirm?: (q: ConfirmQuestion) => Promise<boolean>;
}

export const AppContext = createContext<AppView | null>(null);

export function useApp(): AppView {
  const v = useContext(AppContext);
  if (!v) throw new Error('useApp outside <AppContext.Provider>');
  return v;
}
