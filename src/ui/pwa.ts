// Service worker registration (production builds only) and the "reload to update" notice.
import { Workbox } from 'workbox-window';

export interface UpdateHandle {
  /** Activates the waiting version, then reloads; `beforeReload` runs first (flush the autosave). */
  apply(beforeReload: () => Promise<void>): void;
}

export function registerServiceWorker(onUpdate: (u: UpdateHandle) => void): void {
  if (!import.meta.env.PROD || typeof navigator === 'undefined' || !('serviceWorker' in navigator)) return;
  const wb = new Workbox('/sw.js', { scope: '/' });
  wb.addEventListener('waiting', () => {
    onUpdate({
      apply(beforeReload) {
        void beforeReload().then(() => {
          wb.addEventListener('controlling', () => window.location.reload());
          wb.messageSkipWaiting();
        });
      },
    });
  });
  void wb.register().catch((e: unknown) => console.warn('preheard: service worker not registered', e));
}
