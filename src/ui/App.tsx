// The one page: header with the design pair's actions, the screens, a side panel of key figures.
// Each part lives in its own module under app/; this file only puts them together.
import { useCallback, useMemo, useState } from 'preact/hooks';
import { AppContext, type AppView } from './context.ts';
import { derive } from './engine.ts';
import { CautionsPanel } from './Cautions.tsx';
import type { Autosave } from './persist.ts';
import { registerServiceWorker, type UpdateHandle } from './pwa.ts';
import type { ScreenId, Store } from './store.ts';
import { Banners, SaveIndicator } from './app/Banners.tsx';
import { ConfirmDialog, ProblemsDialog, ShareDialog, type ConfirmQuestion, type ProblemReport } from './app/dialogs.tsx';
import { ProjectDialog } from './app/ProjectDialog.tsx';
import { Glance } from './app/Glance.tsx';
import { Header } from './app/Header.tsx';
import { useNotices, useResolvedTheme, useStoreState, useUndoKeys } from './app/hooks.ts';
import { screenOf } from './app/screens.tsx';
import { Tabs } from './app/Tabs.tsx';
import {
  exportDesign,
  exportProject,
  importFile,
  makeProjectShareUrl,
  makeShareUrl,
  useShareLinks,
  type TransferDeps,
} from './app/transfer.ts';
import { SharedView } from './shared-view.ts';
import { StorageBanners } from './StorageBanners.tsx';
import { retryStorage } from './startup.ts';

export { SCREENS } from './app/screens.tsx';

export function App({ store, autosave }: { store: Store; autosave: Autosave }) {
  const state = useStoreState(store);
  const theme = useResolvedTheme(state.settings.theme);
  const [cautionsOpen, setCautionsOpen] = useState(!state.settings.cautionsDismissed);
  const [problems, setProblems] = useState<ProblemReport | null>(null);
  const [share, setShare] = useState<{ url: string; what: 'pair' | 'project' } | null>(null);
  const [update, setUpdate] = useState<UpdateHandle | null>(null);
  const [projectOpen, setProjectOpen] = useState(false);
  const [question, setQuestion] = useState<{ q: ConfirmQuestion; answer: (yes: boolean) => void } | null>(null);
  const confirm = (q: ConfirmQuestion) => new Promise<boolean>((answer) => setQuestion({ q, answer }));
  const { notices, notify } = useNotices();

  const derived = { a: derive('a', state.designs.a), b: derive('b', state.designs.b) };
  const view: AppView = useMemo(
    () => ({ state, derived, dispatch: (i) => store.dispatch(i), store, confirm }),
    [state, derived.a, derived.b],
  );
  const sharedView = useMemo(() => new SharedView(store, autosave), [store, autosave]);
  const deps: TransferDeps = {
    store,
    derived,
    notify,
    showProblems: setProblems,
    openShared: (project) => sharedView.open(project),
    confirm,
  };

  useShareLinks(deps, () => registerServiceWorker((u) => setUpdate(u)));
  useUndoKeys(store);

  const closeCautions = () => {
    setCautionsOpen(false);
    if (!state.settings.cautionsDismissed) store.dispatch({ type: 'settings', patch: { cautionsDismissed: true } });
  };
  const go = useCallback((screen: ScreenId) => store.dispatch({ type: 'settings', patch: { screen } }), [store]);
  const current = screenOf(state.settings.screen);
  // The same element while the screen is the same: an edit does not re-render the navigation.
  const tabs = useMemo(() => <Tabs screen={current.id} go={go} />, [current.id, go]);

  return (
    <AppContext.Provider value={view}>
      <div class={`app screen-${current.id}`}>
        <Header
          store={store}
          state={state}
          derived={derived}
          actions={{
            importInto: (file, slot) => void importFile(deps, file, slot),
            exportDesign: (slot) => exportDesign(deps, slot),
            exportProject: () => exportProject(deps),
            share: () => void makeShareUrl(deps).then((url) => url && setShare({ url, what: 'pair' })),
            showCautions: () => setCautionsOpen(true),
            confirm,
            compare: (slot, id) => store.dispatch({ type: 'compare', slot, id }),
            openProject: () => setProjectOpen(true),
          }}
        />
        {tabs}
        <Banners update={update} autosave={autosave} exportDesign={(slot) => exportDesign(deps, slot)} />
        <StorageBanners
          autosave={autosave}
          onRetry={() => void retryStorage(store, autosave)}
          onExport={(slot) => exportDesign(deps, slot)}
          onKeepShared={() => void sharedView.keep()}
          onLeaveShared={() => void sharedView.leave()}
        />

        <div class="body">
          <main>
            <div id="screen" role="tabpanel" aria-labelledby={`tab-${current.id}`}>
              {current.render(theme)}
            </div>
          </main>
          {current.wide ? null : <Glance theme={theme} />}
        </div>

        <footer class="status">
          <SaveIndicator autosave={autosave} />
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
        {share ? <ShareDialog url={share.url} what={share.what} onClose={() => setShare(null)} /> : null}
        {projectOpen ? (
          <ProjectDialog
            store={store}
            state={state}
            actions={{
              exportProject: () => exportProject(deps),
              importFile: (file) => void importFile(deps, file, 'a'),
              confirm,
              // The link's dialog takes the project dialog's place.
              share: () =>
                void makeProjectShareUrl(deps).then((url) => {
                  if (!url) return;
                  setProjectOpen(false);
                  setShare({ url, what: 'project' });
                }),
            }}
            onClose={() => setProjectOpen(false)}
          />
        ) : null}
        {question ? (
          <ConfirmDialog
            question={question.q}
            onAnswer={(yes) => {
              setQuestion(null);
              question.answer(yes);
            }}
          />
        ) : null}
      </div>
    </AppContext.Provider>
  );
}
