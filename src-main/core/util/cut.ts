/**
 * Values echoed back in messages are cut to this many characters: enough to recognise a title or an id,
 * while a 5 MB cell cannot make a 5 MB message (nor a 5 MB row in the stored import log). Common practice,
 * no source: about one terminal line.
 */
export const MESSAGE_VALUE_CHARS = 80;

/** `s` cut to `max` characters, the cut marked with '…' (the mark counts towards `max`). */
export function cut(s: string, max = MESSAGE_VALUE_CHARS): string {
  return s.length > max ? `${s.slice(0, max - 1)}…` : s;
}

/** A user's value quoted for a message: 'Moss Lantern', cut as `cut` does. */
export function quote(s: string): string {
  return `'${cut(s)}'`;
}
