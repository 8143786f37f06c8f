import { BugError, InputError } from '../errors.ts';
import { exclusionReasons, type CompiledFilters, type EditorialState } from './candidates.ts';
import type { CurationContext } from './context.ts';
import type { ViolationLog } from './fill-report.ts';

/**
 * The editor's pins as both fills take them, in slot order: a slot outside the shelf or an item pinned to two
 * slots is refused (nothing is filled); a pin of an out-of-stock item is reported and not applied; a pin that
 * breaks a filter, a ban or the rest period is kept (the editor's explicit choice) and reported. `apply` gets
 * each pin that holds, with the words that name it in a report.
 */
export function forEachPin(
  ctx: CurationContext,
  cf: CompiledFilters,
  state: EditorialState,
  n: number,
  log: ViolationLog,
  apply: (slot: number, item: number, label: string) => void,
): void {
  const seen = new Set<number>();
  for (const [slot, item] of [...state.pins].sort((a, b) => a[0] - b[0])) {
    if (!Number.isInteger(slot) || slot < 0 || slot >= n) {
      throw new InputError(`pin: slot ${slot + 1} is outside the shelf of ${n} slots`, { column: 'pins' });
    }
    if (!Number.isInteger(item) || item < 0 || item >= ctx.n) throw new BugError(`fill: pinned item index ${item}`);
    if (seen.has(item)) throw new InputError(`pin: item ${ctx.externalIds[item]} is pinned to two slots`, { column: 'pins' });
    seen.add(item);
    const label = `slot ${slot + 1}: item ${ctx.externalIds[item]}`;
    const why = exclusionReasons(ctx, cf, state, item);
    if (why[0] === 'outOfStock') {
      log.add('pin', `${label} is out of stock; the pin is not applied`);
      continue;
    }
    if (why.length > 0) log.add('pin', `${label} is kept by its pin although it breaks: ${why.join(', ')}`);
    apply(slot, item, label);
  }
}
