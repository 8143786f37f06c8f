import type { ApiResult } from '../../src-main/api/define.ts';
import type { Transport } from './client.ts';

/** What the Electron preload exposes on window.shelfwright (src-main/shell/electron/preload.ts). */
export interface ShelfwrightBridge {
  invoke(method: string, payload: unknown): Promise<ApiResult<unknown>>;
}

declare global {
  interface Window {
    shelfwright?: ShelfwrightBridge;
  }
}

export function createIpcTransport(bridge: ShelfwrightBridge): Transport {
  return (method, payload) => bridge.invoke(method, payload);
}
