import { useEffect } from 'react';
import { fileName } from './components/format.ts';
import { Board } from './screens/Board.tsx';
import { Editions } from './screens/Editions.tsx';
import { Groups } from './screens/Groups.tsx';
import { History } from './screens/History.tsx';
import { Import } from './screens/Import.tsx';
import { Models } from './screens/Models.tsx';
import { Overview } from './screens/Overview.tsx';
import { Planner } from './screens/Planner.tsx';
import { ShelfEditor } from './screens/ShelfEditor.tsx';
import type { ScreenId } from './state/nav-slice.ts';
import { useApp } from './state/store.ts';

/** Same name as src-main/shell/electron/channel.ts MENU_EVENT (the renderer may not import shell code). */
const MENU_EVENT = 'shelfwright:menu';

function Screen({ id }: { id: ScreenId }) {
  switch (id) {
    case 'overview':
      return <Overview />;
    case 'import':
      return <Import />;
    case 'models':
      return <Models />;
    case 'groups':
      return <Groups />;
    case 'editions':
      return <Editions />;
    case 'board':
      return <Board />;
    case 'shelf':
      return <ShelfEditor />;
    case 'history':
      return <History />;
    case 'planner':
      return <Planner />;
  }
}

/** Electron's menu raises a DOM event; undo/redo inside a text field stay the field's own. */
function useMenuCommands() {
  const go = useApp((s) => s.go);
  const undo = useApp((s) => s.undo);
  const redo = useApp((s) => s.redo);
  const shelfOpen = useApp((s) => s.nav.screen === 'shelf');
  useEffect(() => {
    const onMenu = (e: Event) => {
      const c = (e as CustomEvent<string>).detail;
      const inField = document.activeElement instanceof HTMLInputElement || document.activeElement instanceof HTMLTextAreaElement;
      if ((c === 'undo' || c === 'redo') && inField) document.execCommand(c);
      else if (c === 'undo' && shelfOpen) void undo();
      else if (c === 'redo' && shelfOpen) void redo();
      else if (c === 'overview') go('overview');
      else if (c === 'export') go('board');
      else if (c === 'import') go('import');
    };
    window.addEventListener(MENU_EVENT, onMenu);
    return () => window.removeEventListener(MENU_EVENT, onMenu);
  }, [go, undo, redo, shelfOpen]);
}

export function App() {
  const screen = useApp((s) => s.nav.screen);
  const go = useApp((s) => s.go);
  const load = useApp((s) => s.loadWorkspace);
  const file = useApp((s) => s.workspace.info?.file ?? null);
  const edition = useApp((s) => s.curation.edition?.label ?? null);
  const shelf = useApp((s) => s.curation.shelf);
  useMenuCommands();
  useEffect(() => {
    void load();
  }, [load]);
  const screens: { id: ScreenId; label: string }[] = [
    { id: 'overview', label: 'Overview' },
    { id: 'import', label: 'Import' },
    { id: 'models', label: 'Models' },
    { id: 'groups', label: 'Taste groups' },
    { id: 'editions', label: 'Editions' },
    ...(edition ? [{ id: 'board' as const, label: `Edition: ${edition}` }] : []),
    ...(edition && shelf ? [{ id: 'shelf' as const, label: `Shelf: ${shelf}` }] : []),
    { id: 'planner', label: 'Planner' },
    { id: 'history', label: 'History' },
  ];
  return (
    <div className="app">
      <a className="skip" href="#main">
        Skip to content
      </a>
      <nav className="sidebar" aria-label="Screens">
        <p className="brand">Shelfwright</p>
        <ul>
          {screens.map((s) => (
            <li key={s.id}>
              <button type="button" aria-current={screen === s.id ? 'page' : undefined} onClick={() => go(s.id)}>
                {s.label}
              </button>
            </li>
          ))}
        </ul>
        {file && (
          <p className="sidebar-file" title={file}>
            {fileName(file)}
          </p>
        )}
      </nav>
      <main id="main" tabIndex={-1}>
        <Screen id={screen} />
      </main>
    </div>
  );
}
