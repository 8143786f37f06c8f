import { InputError } from '../../core/errors.ts';

export interface StartArgs {
  /** Workspace file; default `.workspaces/demo.sqlite` under the repository. */
  workspace: string | null;
  /** Start the web shell but open no window. */
  noBrowser: boolean;
  /** Use the web shell even when Electron is present. */
  web: boolean;
  /** Fixed port for the web shell; 0 = pick a free one. */
  port: number;
}

const USAGE = 'usage: npm start -- [--workspace FILE] [--no-browser] [--web] [--port N]';

/** Parses `npm start` flags; an unknown flag is an error, not silently ignored. */
export function parseStartArgs(argv: readonly string[]): StartArgs {
  const out: StartArgs = { workspace: null, noBrowser: false, web: false, port: 0 };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i] as string;
    const [flag, inline] = a.startsWith('--') && a.includes('=') ? [a.slice(0, a.indexOf('=')), a.slice(a.indexOf('=') + 1)] : [a, undefined];
    const value = (): string => {
      const v = inline ?? argv[++i];
      if (v === undefined || v === '') throw new InputError(`${flag} needs a value. ${USAGE}`);
      return v;
    };
    switch (flag) {
      case '--workspace':
        out.workspace = value();
        break;
      case '--no-browser':
        out.noBrowser = true;
        break;
      case '--web':
        out.web = true;
        break;
      case '--port': {
        const v = value();
        const n = Number(v);
        if (!Number.isInteger(n) || n < 0 || n > 65535) throw new InputError(`--port must be a whole number from 0 to 65535, got ${v}`);
        out.port = n;
        break;
      }
      default:
        throw new InputError(`unknown option ${a}. ${USAGE}`);
    }
  }
  return out;
}
