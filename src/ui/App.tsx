// The one page: header with the design pair's actions, the screens, a side panel of key figures.
import { useEffect, useMemo, useRef, useState } from 'preact/hooks';
import type { Issue } from '../engine/issues.ts';
import { AppContext, type AppView } from './context.ts';
import { derive, validate } from './engine.ts';
import { CautionsPanel } from './Cautions.tsx';
import { Dialog } from './components/Dialog.tsx';
import { FigureTable } from './FigureTable.tsx';
import { IssueList } from './IssueList.tsx';
import { designFileName, designFileText, downloadText, readDesignText } from './files.ts';
import type { Autosave, SaveStatus } from './persist.ts';
import { registerServiceWorker, type UpdateHandle } from './pwa.ts';
import { decodeShare, encodeShare, hasShare, shareUrl } from './share.ts';
import { SharedView } from './shared-view.ts';
import { StorageBanners } from './StorageBanners.tsx';
import { retryStorage } from './startup.ts';
import { SLOTS, SLOT_LABEL, type AppState, type ScreenId, type Slot, type Store } from './store.ts';
import { Cabinet } from './screens/Cabinet.tsx';
import { ChartCard, Curves, useCharts } from './screens/Curves.tsx';
import { DriveSeat } from './screens/DriveSeat.tsx';
import { DriverSheet } from './screens/DriverSheet.tsx';
import { BlindTrial } from './screens/BlindTrial.tsx';
import { HeadroomProbe } from './screens/HeadroomProbe.tsx';
import { ClientSheet } from './screens/ClientSheet.tsx';
import { Presentation } from './screens/Presentation.tsx';
import { ListeningBench } from './screens/ListeningBench.tsx';
import { StressStrip } from './screens/StressStrip.tsx';

/** The screens, in order. Later screens (listening, stress, trials, probe, client sheet) join this list. */
export const SCREENS: { id: ScreenId; label: string }[] = [
  { id: 'driver', label: 'Driver sheet' },
  { id: 'cabinet', label: 'Cabinet' },
  { id: 'drive', label: 'Drive & seat' },
  { id: 'curves', label: 'Curves' },
  { id: 'bench', label: 'Listening bench' },
  { id: 'stress', label: 'Stress strip' },
  { id: 'trial', label: 'Blind trial' },
  { id: 'headroom', label: 'Headroom probe' },
  { id: 'sheet', label: 'Client sheet' },
  { id: 'present', label: 'Present' },
];

interface ProblemReport {
  title: string;
  intro: string;
  groups: { heading: string; errors: Issue[]; warnings: Issue[] }[];
}

type Notice = { id: number; text: string; tone: 'info' | 'warn' };

function useStoreState(store: Store): AppState {
  const [state, setState] = useState(store.get());
  useEffect(() => store.subscribe((s) => setState(s)), [store]);
  return state;
}

function useSaveStatus(autosave: Autosave): SaveStatus {
  const [s, setS] = useState<SaveStatus>(autosave.status);
  useEffect(() => autosave.onStatus(setS), [autosave]);
  return s;
}

function useResolvedTheme(pref: AppState['settings']['theme']): 'light' | 'dark' {
  const mq = typeof matchMedia === 'function' ? matchMedia('(prefers-color-scheme: dark)') : null;
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

function ProblemsDialog(p: { report: ProblemReport; onClose: () => void }) {
  return (
    <Dialog id="problems" title={p.report.title} tone="error" onClose={p.onClose}>
      <p>{p.report.intro}</p>
      {p.report.groups.map((g) => (
        <div class="problem-group">
          {g.heading ? <h3>{g.heading}</h3> : null}
          <ul class="problems" data-testid="problem-list">
            {g.errors.map((e) => (
              <li class="error">
                <code>{e.path || '(whole file)'}</code> {e.message}
              </li>
            ))}
            {g.warnings.map((e) => (
              <li class="warning">
                <code>{e.path || '(whole file)'}</code> {e.message} <span class="tag">warning</span>
              </li>
            ))}
          </ul>
        </div>
      ))}
    </Dialog>
  );
}

function ShareDialog(p: { url: string; onClose: () => void }) {
  const [copied, setCopied] = useState<string | null>(null);
  const input = useRef<HTMLInputElement>(null);
  return (
    <Dialog
      id="share"
      title="Share link"
      onClose={p.onClose}
      actions={
        <>
          <button
            type="button"
            class="primary"
            onClick={async () => {
              try {
                await navigator.clipboard.writeText(p.url);
                setCopied('Copied to the clipboard.');
              } catch {
                input.current?.select();
                setCopied('Select the link and copy it (the clipboard is not available here).');
              }
            }}
          >
            Copy link
          </button>
          <button type="button" onClick={p.onClose}>
            Close
          </button>
        </>
      }
    >
      <p>
        This link holds both designs, A and B. They travel in the part after “#”, which browsers never send to any server; whoever opens it
        sees the pair and can undo back to their own.
      </p>
      <label class="stack">
        <span>Link</span>
        <input
          ref={input}
          type="text"
          readOnly
          value={p.url}
          data-testid="share-url"
          onFocus={(e) => (e.currentTarget as HTMLInputElement).select()}
        />
      </label>
      <p class="fine" aria-live="polite">
        {copied ?? `${p.url.length} characters.`}
      </p>
    </Dialog>
  );
}

async function downloadSetAside(autosave: Autosave) {
  const text = await autosave.setAsideText();
  if (text === null) return;
  const url = URL.createObjectURL(new Blob([text], { type: 'application/json' }));
  const link = document.createElement('a');
  link.href = url;
  link.download = 'preheard-unreadable-state.json';
  link.click();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

const SAVE_WORDS: Record<Exclude<SaveStatus['kind'], 'saved'>, string> = {
  saving: 'Saving…',
  starting: 'Opening storage…',
  full: 'Not saved: storage full',
  recovered: 'Recovered the last good state',
  waiting: 'Not saved yet: your saved designs are still loading',
  unread: 'Not saved: your saved designs could not be read',
  held: 'Not saved: a shared link is on view',
  unavailable: 'Not saved: storage unavailable',
};

function SaveIndicator({ status }: { status: SaveStatus }) {
  const text = status.kind === 'saved' ? `Saved on this device ${new Date(status.at).toLocaleTimeString()}` : SAVE_WORDS[status.kind];
  return (
    <span class={`save save-${status.kind}`} data-testid="save-status" data-state={status.kind}>
      {text}
    </span>
  );
}

function Glance({ theme }: { theme: string }) {
  const charts = useCharts();
  const spl = charts.find((c) => c.id === 'spl')!;
  const ex = charts.find((c) => c.id === 'excursion')!;
  return (
    <aside class="glance" aria-label="At a glance">
      <FigureTable compact />
      <ChartCard spec={spl} height={190} theme={theme} />
      <ChartCard spec={ex} height={170} theme={theme} />
      <section class="glance-checks" aria-label="Checks">
        <h3>Checks</h3>
        <IssueList />
      </section>
    </aside>
  );
}

export function App({ store, autosave }: { store: Store; autosave: Autosave }) {
  const state = useStoreState(store);
  const status = useSaveStatus(autosave);
  const theme = useResolvedTheme(state.settings.theme);
  const [cautionsOpen, setCautionsOpen] = useState(!state.settings.cautionsDismissed);
  const [problems, setProblems] = useState<ProblemReport | null>(null);
  const [share, setShare] = useState<string | null>(null);
  const [update, setUpdate] = useState<UpdateHandle | null>(null);
  const [notices, setNotices] = useState<Notice[]>([]);
  const fileInput = useRef<HTMLInputElement>(null);
  const importSlot = useRef<Slot>('a');
  const noticeId = useRef(0);
  const sharedView = useMemo(() => new SharedView(store, autosave), [store, autosave]);

  const derived = { a: derive('a', state.designs.a), b: derive('b', state.designs.b) };
  const view: AppView = useMemo(() => ({ state, derived, dispatch: (i) => store.dispatch(i), store }), [state, derived.a, derived.b]);

  const notify = (text: string, tone: Notice['tone'] = 'info') => {
    const id = ++noticeId.current;
    setNotices((n) => [...n.slice(-2), { id, text, tone }]);
    setTimeout(() => setNotices((n) => n.filter((x) => x.id !== id)), 9000);
  };

  // Open a shared link once on start and whenever the fragment changes to one.
  useEffect(() => {
    const openShare = async () => {
      if (!hasShare(location.hash)) return;
      const hash = location.hash;
      history.replaceState(null, '', location.pathname + location.search);
      try {
        const pair = await decodeShare(hash);
        const ra = validate(pair.a);
        const rb = validate(pair.b);
        if (ra.ok && rb.ok) {
          sharedView.open({ a: ra.design, b: rb.design });
        } else {
          setProblems({
            title: 'The shared link has problems',
            intro: 'Nothing was loaded; your designs are unchanged.',
            groups: [
              { heading: 'Design A', errors: ra.ok ? [] : ra.errors, warnings: ra.warnings },
              { heading: 'Design B', errors: rb.ok ? [] : rb.errors, warnings: rb.warnings },
            ],
          });
        }
      } catch (e) {
        setProblems({
          title: 'The shared link cannot be read',
          intro: 'Nothing was loaded; your designs are unchanged.',
          groups: [{ heading: '', errors: [{ path: '', message: (e as Error).message, severity: 'error' }], warnings: [] }],
        });
      }
    };
    void openShare();
    window.addEventListener('hashchange', openShare);
    registerServiceWorker((u) => setUpdate(u));
    return () => window.removeEventListener('hashchange', openShare);
  }, []);

  // Undo / redo from the keyboard, except while a text field handles its own.
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

  const startImport = (slot: Slot) => {
    importSlot.current = slot;
    fileInput.current?.click();
  };
  const onFile = async (e: Event) => {
    const el = e.currentTarget as HTMLInputElement;
    const file = el.files?.[0];
    el.value = '';
    if (!file) return;
    const slot = importSlot.current;
    const r = readDesignText(await file.text(), file.name);
    if (r.ok) {
      store.dispatch({ type: 'replace', slot, design: r.design, reason: `import ${file.name} into ${SLOT_LABEL[slot]}` });
      notify(
        `Imported “${r.design.name}” from ${file.name} into design ${SLOT_LABEL[slot]}${r.warnings.length ? ` with ${r.warnings.length} warnings` : ''}.`,
      );
    } else {
      setProblems({
        title: `${file.name} was not imported`,
        intro: `The file has ${r.errors.length} ${r.errors.length === 1 ? 'problem' : 'problems'}; nothing was loaded and design ${SLOT_LABEL[slot]} is unchanged. Fix the file and import it again.`,
        groups: [{ heading: '', errors: r.errors, warnings: r.warnings }],
      });
    }
  };
  const exportDesign = (slot: Slot) => {
    const d = store.get().designs[slot];
    downloadText(designFileText(d), designFileName(d, SLOT_LABEL[slot]));
    if (derived[slot].parse.ok === false)
      notify(`Design ${SLOT_LABEL[slot]} was exported with its problems; fix them before importing it elsewhere.`, 'warn');
  };
  const openShareDialog = async () => {
    const bad = SLOTS.filter((s) => !derived[s].parse.ok);
    if (bad.length) {
      notify(`Fix the problems in design ${bad.map((s) => SLOT_LABEL[s]).join(' and ')} before sharing.`, 'warn');
      return;
    }
    setShare(shareUrl(location.href, await encodeShare(store.get().designs)));
  };
  const closeCautions = () => {
    setCautionsOpen(false);
    if (!state.settings.cautionsDismissed) store.dispatch({ type: 'settings', patch: { cautionsDismissed: true } });
  };
  const go = (screen: ScreenId) => store.dispatch({ type: 'settings', patch: { screen } });
  const onTabKey = (e: KeyboardEvent) => {
    const i = SCREENS.findIndex((s) => s.id === state.settings.screen);
    let j = -1;
    if (e.key === 'ArrowRight') j = (i + 1) % SCREENS.length;
    else if (e.key === 'ArrowLeft') j = (i - 1 + SCREENS.length) % SCREENS.length;
    else if (e.key === 'Home') j = 0;
    else if (e.key === 'End') j = SCREENS.length - 1;
    if (j < 0) return;
    e.preventDefault();
    go(SCREENS[j].id);
    document.getElementById(`tab-${SCREENS[j].id}`)?.focus();
  };

  const screen = state.settings.screen;
  const storageTrouble = status.kind === 'full' || status.kind === 'unavailable' ? status : null;
  return (
    <AppContext.Provider value={view}>
      <div class={`app screen-${screen}`}>
        <header class="top">
          <div class="brand">
            <img src="/icons/icon.svg" alt="" width={28} height={28} />
            <span class="brand-name">preheard</span>
            <span class="brand-tag">hear a design before building it</span>
          </div>
          <div class="toolbar" role="toolbar" aria-label="Design actions">
            <div class="tgroup">
              <button
                type="button"
                onClick={() => store.dispatch({ type: 'undo' })}
                disabled={!store.canUndo()}
                title={store.undoLabel() ? `Undo ${store.undoLabel()}` : 'Nothing to undo'}
              >
                Undo
              </button>
              <button
                type="button"
                onClick={() => store.dispatch({ type: 'redo' })}
                disabled={!store.canRedo()}
                title={store.redoLabel() ? `Redo ${store.redoLabel()}` : 'Nothing to redo'}
              >
                Redo
              </button>
            </div>
            <div class="tgroup">
              <button type="button" onClick={() => store.dispatch({ type: 'copy-a-to-b' })}>
                Copy A to B
              </button>
              <button type="button" onClick={() => store.dispatch({ type: 'swap' })}>
                Swap
              </button>
              <button type="button" onClick={() => store.dispatch({ type: 'reset-demo' })}>
                Reset to demo pair
              </button>
            </div>
            <details class="menu tgroup">
              <summary>Files</summary>
              <div class="menu-body" role="menu">
                {SLOTS.map((s) => (
                  <button type="button" role="menuitem" onClick={(e) => (closeMenu(e), startImport(s))}>
                    Import design into {SLOT_LABEL[s]}…
                  </button>
                ))}
                {SLOTS.map((s) => (
                  <button type="button" role="menuitem" onClick={(e) => (closeMenu(e), exportDesign(s))}>
                    Export design {SLOT_LABEL[s]}
                  </button>
                ))}
                <button type="button" role="menuitem" onClick={(e) => (closeMenu(e), void openShareDialog())}>
                  Share link…
                </button>
              </div>
            </details>
            <div class="tgroup">
              <label class="theme">
                <span class="visually-hidden">Theme</span>
                <select
                  value={state.settings.theme}
                  onChange={(e) =>
                    store.dispatch({
                      type: 'settings',
                      patch: { theme: (e.currentTarget as HTMLSelectElement).value as AppState['settings']['theme'] },
                    })
                  }
                >
                  <option value="auto">Theme: system</option>
                  <option value="light">Theme: light</option>
                  <option value="dark">Theme: dark</option>
                </select>
              </label>
              <button type="button" onClick={() => setCautionsOpen(true)}>
                Cautions
              </button>
            </div>
          </div>
          <input
            ref={fileInput}
            type="file"
            accept=".json,application/json"
            class="visually-hidden"
            tabIndex={-1}
            aria-hidden="true"
            data-testid="import-file"
            onChange={onFile}
          />
        </header>

        {update ? (
          <div class="banner banner-update" role="status">
            A new version of preheard is ready.
            <button type="button" class="primary small" onClick={() => update.apply(() => autosave.flush())}>
              Reload to update
            </button>
            <span class="fine">Your designs are saved first; nothing is lost.</span>
          </div>
        ) : null}
        {storageTrouble ? (
          <div class="banner banner-warn" role="alert" data-testid="storage-banner">
            {storageTrouble.message}
            {SLOTS.map((s) => (
              <button type="button" class="small" onClick={() => exportDesign(s)}>
                Export {SLOT_LABEL[s]}
              </button>
            ))}
          </div>
        ) : null}
        <StorageBanners
          status={status}
          onRetry={() => void retryStorage(store, autosave)}
          onExport={exportDesign}
          onKeepShared={() => sharedView.keep()}
          onLeaveShared={() => void sharedView.leave()}
        />
        {status.kind === 'recovered' ? (
          <div class="banner banner-warn" role="alert" data-testid="recovery-banner">
            {status.message}
            <button type="button" class="small" onClick={() => void downloadSetAside(autosave)}>
              Download the unreadable data
            </button>
            <button type="button" class="small" onClick={() => autosave.acknowledge()}>
              Dismiss
            </button>
          </div>
        ) : null}

        <nav class="tabs" aria-label="Screens">
          <div role="tablist" aria-label="Screens" onKeyDown={onTabKey}>
            {SCREENS.map((s) => (
              <button
                type="button"
                role="tab"
                id={`tab-${s.id}`}
                aria-selected={screen === s.id}
                aria-controls="screen"
                tabIndex={screen === s.id ? 0 : -1}
                class={screen === s.id ? 'active' : ''}
                onClick={() => go(s.id)}
              >
                {s.label}
              </button>
            ))}
          </div>
          <div class="pair" aria-label="The two designs">
            {SLOTS.map((s) => (
              <span class={`pair-item pair-${s}`}>
                <span class={`chip chip-${s}`}>{SLOT_LABEL[s]}</span>
                <span class="pair-name">{state.designs[s].name}</span>
                {derived[s].parse.ok ? null : (
                  <span class="badge-error">{derived[s].issues.filter((i) => i.severity === 'error').length} errors</span>
                )}
              </span>
            ))}
          </div>
        </nav>

        <div class="body">
          <main>
            <div id="screen" role="tabpanel" aria-labelledby={`tab-${screen}`}>
              {screen === 'driver' ? (
                <DriverSheet />
              ) : screen === 'cabinet' ? (
                <Cabinet />
              ) : screen === 'drive' ? (
                <DriveSeat />
              ) : screen === 'bench' ? (
                <ListeningBench theme={theme} />
              ) : screen === 'stress' ? (
                <StressStrip theme={theme} />
              ) : screen === 'curves' ? (
                <Curves theme={theme} />
              ) : null}
              {screen === 'trial' ? (
                <BlindTrial />
              ) : screen === 'headroom' ? (
                <HeadroomProbe />
              ) : screen === 'sheet' ? (
                <ClientSheet />
              ) : screen === 'present' ? (
                <Presentation />
              ) : null}
            </div>
          </main>
          {screen === 'curves' || screen === 'bench' || screen === 'stress' || screen === 'sheet' || screen === 'present' ? null : (
            <Glance theme={theme} />
          )}
        </div>

        <footer class="status">
          <SaveIndicator status={status} />
          <span>Runs on this machine only: nothing is uploaded. Curves are model estimates.</span>
          <span class="build" data-testid="build">
            preheard {__APP_VERSION__}
            {import.meta.env.VITE_BUILD_ID ? ` · ${import.meta.env.VITE_BUILD_ID}` : ''}
          </span>
        </footer>

        <div class="notices" aria-live="polite">
          {notices.map((n) => (
            <p class={`notice notice-${n.tone}`}>{n.text}</p>
          ))}
        </div>

        {cautionsOpen ? <CautionsPanel onClose={closeCautions} firstRun={!state.settings.cautionsDismissed} /> : null}
        {problems ? <ProblemsDialog report={problems} onClose={() => setProblems(null)} /> : null}
        {share ? <ShareDialog url={share} onClose={() => setShare(null)} /> : null}
      </div>
    </AppContext.Provider>
  );
}

function closeMenu(e: Event) {
  (e.currentTarget as HTMLElement).closest('details')?.removeAttribute('open');
}
