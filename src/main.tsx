import { render } from 'preact';
import { App } from './ui/App.tsx';
import { demoPair } from './ui/demo.ts';
import { afterEditsPause, Autosave, indexedDbBackend } from './ui/persist.ts';
import { Store } from './ui/store.ts';
import { connectTabs } from './ui/tabsync.ts';
import { flushOnLeave, startStorage } from './ui/startup.ts';
import './ui/styles.css';

const store = new Store(demoPair);
// Saves wait for a pause in the edits; the journal keeps an edit not yet saved when the page goes.
const autosave = new Autosave(indexedDbBackend(), Date.now, afterEditsPause());
// A reload restores exactly what was there; a slow or failed read shows the demo pair, says so and
// saves nothing over the stored designs.
await startStorage(store, autosave);
flushOnLeave(autosave);
if (typeof BroadcastChannel !== 'undefined') connectTabs(store, autosave, new BroadcastChannel('preheard-designs'));

// The UI benchmark (test/bench/ui-redraw.ts) drives the store directly when the page is opened with ?bench.
if (new URLSearchParams(location.search).has('bench')) (window as unknown as { __preheard: unknown }).__preheard = { store };

render(<App store={store} autosave={autosave} />, document.getElementById('app')!);
