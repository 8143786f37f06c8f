/**
 * Terminal safety for everything the command line prints: user data (titles, ids, categories, messages
 * quoting a file's cells) may carry control characters, and a title holding ESC sequences could clear the
 * screen or retitle the terminal (ECMA-48 / ISO 6429 define C0 = U+0000-U+001F, DEL = U+007F and
 * C1 = U+0080-U+009F, the bytes a terminal acts on). Every one of them is shown as a visible escape
 * instead, except the line feed our own output is made of.
 *
 * `text` form: `\x1b`, `\t`, `\r`, `\x9b`. `json` form (stdout under --json): `\u009b`, a JSON escape,
 * so the output still parses to the same strings (JSON.stringify escapes C0 itself, not DEL or C1).
 */
// eslint-disable-next-line no-control-regex -- matching control characters is this file's purpose
const CONTROLS = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/g;
const NAMED: Readonly<Record<string, string>> = { '\t': '\\t', '\r': '\\r' };
const hex2 = (c: string) => c.charCodeAt(0).toString(16).padStart(2, '0');

export function escapeControls(text: string, form: 'text' | 'json' = 'text'): string {
  CONTROLS.lastIndex = 0;
  if (!CONTROLS.test(text)) return text; // the usual case: nothing to copy
  return form === 'json'
    ? text.replace(CONTROLS, (c) => `\\u00${hex2(c)}`)
    : text.replace(CONTROLS, (c) => NAMED[c] ?? `\\x${hex2(c)}`);
}
