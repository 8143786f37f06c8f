import fs from 'node:fs';
import path from 'node:path';

const KEEP = 8;

/** Recently opened workspace files, newest first, kept in the app's user-data folder. */
export function loadRecent(file: string): string[] {
  try {
    const raw: unknown = JSON.parse(fs.readFileSync(file, 'utf8'));
    return Array.isArray(raw) ? raw.filter((x): x is string => typeof x === 'string').slice(0, KEEP) : [];
  } catch {
    return [];
  }
}

export function rememberRecent(file: string, workspace: string): string[] {
  const list = [workspace, ...loadRecent(file).filter((f) => f !== workspace)].slice(0, KEEP);
  fs.mkdirSync(path.dirname(file), { recursive: true });
  fs.writeFileSync(file, JSON.stringify(list));
  return list;
}
