/**
 * The installable offline app: registers the service worker (production build in a secure context
 * only; never the single-file build opened from disk) and holds "a new version is ready" until the user
 * reloads. The reload saves the session first, so an update never loses an edit.
 *
 * Plain Service Worker API (W3C Service Workers: register, updatefound, installed/waiting, activate,
 * controllerchange). It also works when the page was opened with the server gone: register() then fails
 * (the browser cannot fetch sw.js to check for an update), and the page watches the registration it
 * already has, so an update served later still shows the banner.
 */
import { create } from 'zustand';
import { flushAutosave } from './autosave';

interface UpdateState {
  /** A new version is installed and waiting. */
  ready: boolean;
  /** The app is precached: it will open with the network off. */
  offlineReady: boolean;
}

export const useUpdate = create<UpdateState>(() => ({ ready: false, offlineReady: false }));

let registration: ServiceWorkerRegistration | null = null;
let reloading = false;
let reloaded = false;

function reloadOnce(): void {
  if (reloaded) return;
  reloaded = true;
  location.reload();
}

function serviceWorkerAllowed(): boolean {
  return (
    import.meta.env.PROD &&
    import.meta.env.MODE !== 'single' &&
    typeof window !== 'undefined' &&
    window.isSecureContext &&
    location.protocol !== 'file:' &&
    'serviceWorker' in navigator
  );
}

/** An installed worker waits while an older one is active: that is an update (the first install is not). */
function noteWaiting(reg: ServiceWorkerRegistration): void {
  if (reg.waiting && reg.active) useUpdate.setState({ ready: true });
}

function watch(reg: ServiceWorkerRegistration): void {
  registration = reg;
  if (reg.active) useUpdate.setState({ offlineReady: true });
  noteWaiting(reg);
  const follow = (sw: ServiceWorker) =>
    sw.addEventListener('statechange', () => {
      if (sw.state === 'installed') noteWaiting(reg);
      if (sw.state === 'activated') {
        useUpdate.setState({ offlineReady: true });
        if (reloading) reloadOnce();
      }
    });
  if (reg.installing) follow(reg.installing);
  if (reg.waiting) follow(reg.waiting); // waiting from an earlier visit: its activation reloads too
  reg.addEventListener('updatefound', () => {
    if (reg.installing) follow(reg.installing);
  });
  navigator.serviceWorker.addEventListener('controllerchange', () => {
    if (reloading) reloadOnce();
  });
}

export async function registerOfflineApp(): Promise<void> {
  if (!serviceWorkerAllowed()) return;
  let reg: ServiceWorkerRegistration | undefined;
  try {
    reg = await navigator.serviceWorker.register('./sw.js', { scope: './' });
  } catch {
    // Server gone (sw.js cannot be fetched): keep following the registration made on an earlier visit.
    reg = await navigator.serviceWorker.getRegistration('./').catch(() => undefined);
  }
  if (reg) watch(reg);
}

/**
 * Why reloading now could lose work, or null when the session is safely saved first: autosave is paused
 * while the page asks whether to restore an earlier session (and this page already has changes), or the
 * browser's storage is unavailable or failing.
 */
export function unsavedWorkReason(
  autosave: { offer: unknown; status: string },
  revision: number,
): 'restore-pending' | 'storage-off' | null {
  if (autosave.offer && revision > 0) return 'restore-pending';
  if (autosave.status === 'off' || autosave.status === 'failed') return 'storage-off';
  return null;
}

/** Saves the session, then lets the waiting version take over; the page reloads when it has. */
export async function reloadToUpdate(): Promise<void> {
  await flushAutosave();
  const waiting = registration?.waiting;
  reloading = true;
  if (!waiting) {
    reloadOnce();
    return;
  }
  // workbox's generated worker calls skipWaiting() on this message.
  waiting.postMessage({ type: 'SKIP_WAITING' });
}
