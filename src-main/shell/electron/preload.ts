/**
 * Runs sandboxed before the page (contextIsolation on): exposes exactly one function, and checks the
 * method name against the contract before anything crosses to the main process (the habit in STYLE.md §1:
 * a tiny, validated bridge). Bundled on its own, because a sandboxed preload can require only 'electron'.
 */
import { contextBridge, ipcRenderer } from 'electron';
import { isMethodName } from '../../api/contract.ts';
import type { ApiResult } from '../../api/define.ts';
import { INVOKE_CHANNEL } from './channel.ts';

async function invoke(method: unknown, payload: unknown): Promise<ApiResult<unknown>> {
  if (typeof method !== 'string' || !isMethodName(method)) {
    return { ok: false, error: { code: 'input', message: `unknown method: ${String(method)}` } };
  }
  return (await ipcRenderer.invoke(INVOKE_CHANNEL, method, payload)) as ApiResult<unknown>;
}

contextBridge.exposeInMainWorld('shelfwright', { invoke });
