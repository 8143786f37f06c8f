import { editDistance } from '../../core/util/edit-distance.ts';

/**
 * Node's parseArgs errors said plainly for one command: an unknown option with the nearest known ones, a
 * missing value, a value given to a switch. parseArgs' own text speaks of positionals and '--'.
 */

/** Known options near `typed`: those containing it or contained in it, else within edit distance 2; up to 3. */
export function nearestOptions(typed: string, known: readonly string[]): string[] {
  const t = typed.toLowerCase();
  if (t === '') return [];
  const scored: [string, number][] = [];
  for (const k of known) {
    const n = k.toLowerCase();
    // A part of the name (--values for --knn-values, --seeds for --seed) is nearer than any misspelling; a
    // name of one or two letters (--k, --n) is inside too many words to suggest that way.
    if ((t.length >= 2 && n.includes(t)) || (n.length >= 3 && t.includes(n))) scored.push([k, -1]);
    else {
      const d = editDistance(t, n, 2);
      if (d <= Math.min(2, Math.floor(t.length / 2))) scored.push([k, d]);
    }
  }
  scored.sort((a, b) => a[1] - b[1] || a[0].length - b[0].length || a[0].localeCompare(b[0]));
  const best = scored[0]?.[1];
  return scored.filter(([, d]) => d === best).slice(0, 3).map(([k]) => k);
}

const orList = (xs: string[]) => (xs.length <= 1 ? xs.join('') : `${xs.slice(0, -1).join(', ')} or ${xs.at(-1)!}`);

/** The flag a parseArgs message names, long form first: "Option '-w, --workspace <value>' ..." → --workspace. */
function flagIn(message: string): string | undefined {
  const quoted = /'([^']*)'/.exec(message)?.[1] ?? '';
  return /--[^\s,<=]+/.exec(quoted)?.[0] ?? /-[^\s,<=]+/.exec(quoted)?.[0];
}

/** One line for a parseArgs error, or undefined when it is not one of those known here (its text is kept). */
export function optionErrorWords(e: { code?: string; message: string }, commandName: string, known: readonly string[]): string | undefined {
  const flag = flagIn(e.message);
  if (!flag) return undefined;
  if (e.code === 'ERR_PARSE_ARGS_UNKNOWN_OPTION') {
    const near = flag.startsWith('--') ? nearestOptions(flag.slice(2).split('=')[0]!, known) : [];
    const hint = near.length ? `; did you mean ${orList(near.map((n) => `--${n}`))}?` : '';
    return `unknown option ${flag} for 'shelfwright ${commandName}'${hint}`;
  }
  if (e.code === 'ERR_PARSE_ARGS_INVALID_OPTION_VALUE') {
    if (/does not take an argument/.test(e.message)) return `${flag} is a switch and takes no value`;
    // Ambiguous: the next word starts with '-' (a forgotten value before the next flag, or a negative number).
    if (/argument missing|ambiguous/.test(e.message)) return `${flag} needs a value (${flag} VALUE, or ${flag}=VALUE for one that starts with '-')`;
  }
  return undefined;
}
