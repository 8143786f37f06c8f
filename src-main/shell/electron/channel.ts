/** The one IPC channel between preload and main; its only message is an api call. */
export const INVOKE_CHANNEL = 'shelfwright:invoke';
/** The privileged scheme the renderer is served from (not file://, so CSP headers and origin checks apply). */
export const APP_SCHEME = 'app';
export const APP_ORIGIN = 'app://shelfwright';
/** DOM event the main process raises in the page for menu commands; carries no data from the page back. */
export const MENU_EVENT = 'shelfwright:menu';
export type MenuCommand = 'import' | 'export' | 'undo' | 'redo' | 'overview';
