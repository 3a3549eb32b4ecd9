/**
 * "A new version is ready": shown when the service worker has a waiting update. The reload saves the
 * session first; when it cannot (autosave paused by the restore question, or storage unavailable) the
 * banner says so instead of losing work silently.
 */
import { useAutosave } from '../state/autosave';
import { useApp } from '../state/store';
import { reloadToUpdate, unsavedWorkReason, useUpdate } from '../state/update';

export function UpdateBanner() {
  const ready = useUpdate((s) => s.ready);
  const offer = useAutosave((s) => s.offer);
  const status = useAutosave((s) => s.status);
  const revision = useApp((s) => s.revision);
  if (!ready) return null;
  const reason = unsavedWorkReason({ offer, status }, revision);
  return (
    <div className="update-banner" role="status" aria-label="Update" data-unsaved={reason ?? 'none'}>
      A new version of Borewave is ready.{' '}
      {reason === 'restore-pending'
        ? 'Autosave is paused until you answer the restore question above: reloading now keeps the earlier saved session but loses the changes made on this page since it opened.'
        : reason === 'storage-off'
          ? 'Autosave is not working in this browser: reloading now loses the current session (export a project archive first).'
          : 'Your session is saved first.'}{' '}
      <button type="button" onClick={() => void reloadToUpdate()}>
        {reason ? 'Reload anyway' : 'Reload now'}
      </button>
    </div>
  );
}
