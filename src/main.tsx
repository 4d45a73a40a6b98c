import { render } from 'preact';
import { App } from './ui/App.tsx';
import { demoPair } from './ui/demo.ts';
import { Autosave, indexedDbBackend } from './ui/persist.ts';
import { Store } from './ui/store.ts';
import { connectTabs } from './ui/tabsync.ts';
import './ui/styles.css';

const store = new Store(demoPair);
const autosave = new Autosave(indexedDbBackend());
// A reload restores exactly what was there; a storage failure leaves the demo pair and says so.
const saved = await Promise.race([autosave.load(), new Promise<undefined>((r) => setTimeout(() => r(undefined), 3000))]);
if (saved) store.dispatch({ type: 'restore', state: saved });
autosave.attach(store);
if (typeof BroadcastChannel !== 'undefined') connectTabs(store, autosave, new BroadcastChannel('preheard-designs'));

// The UI benchmark (test/bench/ui-redraw.ts) drives the store directly when the page is opened with ?bench.
if (new URLSearchParams(location.search).has('bench')) (window as unknown as { __preheard: unknown }).__preheard = { store };

render(<App store={store} autosave={autosave} />, document.getElementById('app')!);
