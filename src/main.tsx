import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './ui/App';
import './ui/app.css';
import { watchProcessing } from './state/processing';
import { checkForSavedSession, useAutosave } from './state/autosave';
import { registerOfflineApp } from './state/update';
import { useApp, useResults } from './state/store';
import { currentDerived, lastDeriveMs, lastSpreadMs, viewsBehind } from './state/derived';
import { ioLane, processLane } from './worker/client';
import { loadPlotly } from './ui/plot';

watchProcessing();
void checkForSavedSession();

// Read-only handles for the end-to-end tests and measurements (no effect on the app).
(window as unknown as { __borewave: unknown }).__borewave = {
  useApp,
  useResults,
  useAutosave,
  derived: currentDerived,
  deriveMs: () => lastDeriveMs,
  spreadMs: () => lastSpreadMs,
  /** Panes still to take up the latest results (the Trace board and the strip follow the Profile). */
  viewsBehind,
  /** Resolves once Plotly is loaded (it loads after the first paint). */
  plotlyLoaded: () => loadPlotly().then(() => true),
};

// After first paint: the service worker (installable, offline after one visit) in the production build.
window.addEventListener('load', () => void registerOfflineApp());

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <App />
  </StrictMode>,
);

// After the first paint: start both workers and load Plotly, so a drop or a demo click does not wait for them.
requestAnimationFrame(() =>
  setTimeout(() => {
    ioLane.warm();
    processLane.warm();
    void loadPlotly();
  }, 0),
);
