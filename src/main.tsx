import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './ui/App';
import './ui/app.css';
import { watchProcessing } from './state/processing';
import { checkForSavedSession, useAutosave } from './state/autosave';
import { useApp, useResults } from './state/store';
import { currentDerived, lastDeriveMs, lastSpreadMs } from './state/derived';

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
};

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
