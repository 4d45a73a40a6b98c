// The page's small hooks: the store's state, the save status, the theme in use, passing notices.
import { useEffect, useMemo, useRef, useState } from 'preact/hooks';
import type { Autosave, SaveStatus } from '../persist.ts';
import type { AppState, Store } from '../store.ts';

export function useStoreState(store: Store): AppState {
  const [state, setState] = useState(store.get());
  useEffect(() => store.subscribe((s) => setState(s)), [store]);
  return state;
}

/**
 * The save status, read where it is shown (the banners, the footer) rather than by the page: a
 * finished save then redraws those few elements, not every screen and chart.
 */
export function useSaveStatus(autosave: Autosave): SaveStatus {
  const [s, setS] = useState<SaveStatus>(autosave.status);
  useEffect(() => {
    const off = autosave.onStatus(setS);
    // A change between the first render and this subscription is not missed.
    setS(autosave.status);
    return off;
  }, [autosave]);
  return s;
}

/** The theme asked for, "auto" resolved from the system's preference; set on the document. */
export function useResolvedTheme(pref: AppState['settings']['theme']): 'light' | 'dark' {
  // Asked once: the query list follows the system's preference by itself.
  const mq = useMemo(() => (typeof matchMedia === 'function' ? matchMedia('(prefers-color-scheme: dark)') : null), []);
  const [dark, setDark] = useState(mq?.matches ?? false);
  useEffect(() => {
    if (!mq) return;
    const on = () => setDark(mq.matches);
    mq.addEventListener?.('change', on);
    return () => mq.removeEventListener?.('change', on);
  }, []);
  const theme = pref === 'auto' ? (dark ? 'dark' : 'light') : pref;
  useEffect(() => {
    document.documentElement.dataset.theme = theme;
  }, [theme]);
  return theme;
}

export type Notice = { id: number; text: string; tone: 'info' | 'warn' };

/** Short notices that go away by themselves; at most three at once. */
export function useNotices(): { notices: Notice[]; notify: (text: string, tone?: Notice['tone']) => void } {
  const [notices, setNotices] = useState<Notice[]>([]);
  const noticeId = useRef(0);
  const notify = (text: string, tone: Notice['tone'] = 'info') => {
    const id = ++noticeId.current;
    setNotices((n) => [...n.slice(-2), { id, text, tone }]);
    setTimeout(() => setNotices((n) => n.filter((x) => x.id !== id)), 9000);
  };
  return { notices, notify };
}

/** Undo / redo from the keyboard, except while a text field handles its own. */
export function useUndoKeys(store: Store) {
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (!(e.ctrlKey || e.metaKey)) return;
      const t = e.target as HTMLElement | null;
      if (t && (t.tagName === 'INPUT' || t.tagName === 'TEXTAREA')) return;
      const k = e.key.toLowerCase();
      if (k === 'z' && !e.shiftKey) store.dispatch({ type: 'undo' });
      else if ((k === 'z' && e.shiftKey) || k === 'y') store.dispatch({ type: 'redo' });
      else return;
      e.preventDefault();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);
}
