import fs from 'node:fs';
import path from 'node:path';

export interface WindowState {
  width: number;
  height: number;
  x?: number;
  y?: number;
  maximized: boolean;
}

/** The size the screens are designed for (1280×800); also the smallest the layout is tested at. */
export const DEFAULT_WINDOW: WindowState = { width: 1280, height: 800, maximized: false };
const MIN = { width: 960, height: 640 };

/**
 * Reads the remembered window size. A missing, unreadable or odd file gives the default rather than an
 * error: a lost window size is never worth stopping the app for.
 */
export function loadWindowState(file: string): WindowState {
  let raw: unknown;
  try {
    raw = JSON.parse(fs.readFileSync(file, 'utf8'));
  } catch {
    return { ...DEFAULT_WINDOW };
  }
  if (typeof raw !== 'object' || raw === null) return { ...DEFAULT_WINDOW };
  const r = raw as Record<string, unknown>;
  const int = (v: unknown): number | undefined => (typeof v === 'number' && Number.isInteger(v) ? v : undefined);
  const width = int(r.width);
  const height = int(r.height);
  if (width === undefined || height === undefined) return { ...DEFAULT_WINDOW };
  const out: WindowState = {
    width: Math.max(MIN.width, Math.min(width, 10_000)),
    height: Math.max(MIN.height, Math.min(height, 10_000)),
    maximized: r.maximized === true,
  };
  const x = int(r.x);
  const y = int(r.y);
  if (x !== undefined && y !== undefined) {
    out.x = x;
    out.y = y;
  }
  return out;
}

/** Writes through a temp file and a rename, so a crash mid-write never leaves half a JSON behind. */
export function saveWindowState(file: string, state: WindowState): void {
  fs.mkdirSync(path.dirname(file), { recursive: true });
  const tmp = `${file}.tmp`;
  fs.writeFileSync(tmp, JSON.stringify(state));
  fs.renameSync(tmp, file);
}
