import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './App.tsx';
import { createClient, type Transport, type Uploader } from './client/client.ts';
import { createHttpTransport, createHttpUploader, readLaunchToken } from './client/http-transport.ts';
import { createIpcTransport } from './client/ipc-transport.ts';
import { createAppStore, StoreContext } from './state/store.ts';
import './styles.css';

/** Electron's preload provides window.shelfwright; otherwise the web shell's token signs HTTP calls. */
function pickTransport(): { transport: Transport; uploader?: Uploader; serverPaths: boolean } | string {
  if (window.shelfwright) return { transport: createIpcTransport(window.shelfwright), serverPaths: true };
  const token = readLaunchToken(window.location, window.history, sessionStorageOrNull());
  if (!token) return 'This page needs the address Shelfwright printed when it started (the part after # carries the key of this launch). Open that address, or restart with npm start.';
  return { transport: createHttpTransport(token), uploader: createHttpUploader(token), serverPaths: false };
}

/** Reading window.sessionStorage throws where storage is disabled; the page then works until a reload. */
function sessionStorageOrNull(): Storage | null {
  try {
    return window.sessionStorage;
  } catch {
    return null;
  }
}

const root = createRoot(document.getElementById('root') as HTMLElement);
const picked = pickTransport();
if (typeof picked === 'string') {
  root.render(
    <p className="error" role="alert">
      {picked}
    </p>,
  );
} else {
  const store = createAppStore(createClient(picked.transport, picked.uploader, { serverPaths: picked.serverPaths }));
  root.render(
    <StrictMode>
      <StoreContext.Provider value={store}>
        <App />
      </StoreContext.Provider>
    </StrictMode>,
  );
}
