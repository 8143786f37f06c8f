import type { z } from 'zod';
import type { BriefRequest } from '../../core/editing/brief-schema.ts';
import { anchorExternalIds, anchorRowIds } from '../../services/curation/anchors.ts';
import { backtestShelf } from '../../services/curation/backtest.ts';
import { curationRepos } from '../../services/curation/repos.ts';
import { curationModelSource } from '../../services/curation/model-source.ts';
import { forgetTasteGroupName, nameTasteGroup, setTasteGroupSettings, tasteGroupsView } from '../../services/curation/taste-groups.ts';
import { CurationService, type ActionRequest } from '../../services/curation/service.ts';
import type { EditionView, ShelfView } from '../../services/curation/views.ts';
import { exportEdition, exportNotes } from '../../services/export/index.ts';
import { pictureUrls } from '../../services/pictures.ts';
import type { AppContext } from '../../services/context.ts';
import { forgetCustomer } from '../../services/forget.ts';
import type { ResponseOf } from '../contract.ts';
import type { Handler } from '../handler-table.ts';
import type { ApiBriefRequest, ShelfAction } from '../contracts/curation.ts';

/** NaN and ±Infinity (a reading with no data) become null: JSON has no NaN, and the schemas say null. */
export function finite<T>(v: T): T {
  if (typeof v === 'number') return (Number.isFinite(v) ? v : null) as T;
  if (Array.isArray(v)) return v.map(finite) as T;
  if (v !== null && typeof v === 'object') {
    const out: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v)) out[k] = finite(x);
    return out as T;
  }
  return v;
}


/** A sink by f is a multiplier of 1/f: the api keeps both words, the log keeps one factor. */
function toRequest(a: ShelfAction, rowIds: (ext: string[]) => number[]): ActionRequest {
  if (a.kind === 'anchors') return { kind: 'anchors', anchors: rowIds(a.anchors) };
  return a.kind === 'sink' ? { kind: 'boost', item: a.item, factor: 1 / a.factor } : a;
}

type Names =
  | 'edition.new'
  | 'edition.list'
  | 'edition.show'
  | 'edition.publish'
  | 'edition.compare'
  | 'edition.export'
  | 'catalogue.names'
  | 'shelf.add'
  | 'shelf.brief'
  | 'shelf.targets'
  | 'shelf.fill'
  | 'shelf.show'
  | 'shelf.act'
  | 'shelf.undo'
  | 'shelf.redo'
  | 'shelf.whatif'
  | 'shelf.backtest'
  | 'customer.forget'
  | 'audience.groups'
  | 'audience.settings'
  | 'audience.name';

export function curationHandlers(ctx: AppContext): { [M in Names]: Handler<M> } {
  const svc = () => new CurationService(ctx.db, curationModelSource);
  // The request's brief was parsed by the contract (ApiBriefRequest, built on core's BriefRequestSchema); only
  // its anchors change here, from item ids to row ids, so it is the core type (as core's parseBriefRequest casts).
  const withAnchorIds = (b: z.output<typeof ApiBriefRequest>) => ({ ...b, anchors: anchorRowIds(ctx.db, b.anchors) }) as BriefRequest;
  const apiShelf = (v: ShelfView) => ({ ...v, brief: { ...v.brief, anchors: anchorExternalIds(ctx.db, v.brief.anchors) } });
  const shelf = (v: ShelfView) => finite(apiShelf(v)) as unknown as ResponseOf<'shelf.show'>;
  const edition = (v: EditionView) => finite({ ...v, shelves: v.shelves.map(apiShelf) }) as unknown as ResponseOf<'edition.show'>;
  return {
    'edition.new': (r) => edition(svc().newEdition(r.label, r.date, r.from)),
    'edition.list': () => ({
      editions: svc()
        .listEditions()
        .map((e) => ({ id: e.id, label: e.label, date: e.date, status: e.status, publishedAt: e.publishedAt })),
    }),
    'edition.show': (r) => edition(svc().showEdition(r.edition)),
    'edition.publish': (r) => {
      const s = svc().publish(r.edition);
      const items = s.shelves.reduce((n, x) => n + x.slots.filter((y) => y.itemId !== null).length, 0);
      return { edition: s.edition.label, publishedAt: s.publishedAt, shelves: s.shelves.length, items };
    },
    'edition.compare': (r) => ({ a: r.a, b: r.b, ...svc().compare(r.a, r.b) }),
    'edition.export': (r) => {
      const snap = svc().snapshotOf(r.edition);
      const safe = snap.edition.label.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'edition';
      const ids = snap.shelves.flatMap((x) => x.slots.flatMap((y) => (y.externalId === null ? [] : [y.externalId])));
      const pictures = r.format === 'html' ? pictureUrls(ctx.db, ids) : undefined;
      const notes = exportNotes(snap, r.format);
      return { format: r.format, filename: `${safe}.${r.format}`, content: exportEdition(snap, r.format, pictures), notes: notes === null ? null : { filename: `${safe}.notes.txt`, content: notes } };
    },
    'catalogue.names': () => curationRepos(ctx.db).items.names(),
    'shelf.add': (r) => shelf(svc().addShelf(r.edition, r.label, withAnchorIds(r.brief))),
    'shelf.brief': (r) => shelf(svc().setBrief(r.edition, r.shelf, withAnchorIds(r.brief), r.reason)),
    'shelf.targets': (r) => shelf(svc().setTargets(r.edition, r.shelf, r.targets)),
    'shelf.fill': (r) => shelf(svc().fill(r.edition, r.shelf, true)),
    'shelf.show': (r) => shelf(svc().fill(r.edition, r.shelf, false)),
    'shelf.act': (r) => shelf(svc().act(r.edition, r.shelf, toRequest(r.action, (ids) => anchorRowIds(ctx.db, ids)), r.reason)),
    'shelf.undo': (r) => shelf(svc().undo(r.edition, r.shelf)),
    'shelf.redo': (r) => shelf(svc().redo(r.edition, r.shelf)),
    'shelf.whatif': (r) => finite(svc().whatIf(r.edition, r.shelf, r.slot, r.n)),
    'shelf.backtest': (r) => {
      const s = svc();
      const e = s.editions.byLabel(r.edition);
      const sh = s.shelves.byLabel(e.id, r.shelf);
      return finite(backtestShelf(s.world(), sh, s.shelves.slots(sh.id), r.windowDays));
    },
    'customer.forget': (r) => forgetCustomer(ctx.db, r.customer),
    'audience.groups': () => finite(tasteGroupsView(ctx.db, svc().world().ds)),
    'audience.settings': (r) => {
      const s: Parameters<typeof setTasteGroupSettings>[2] = {};
      if (r.minK !== undefined) s.minK = r.minK;
      if (r.maxK !== undefined) s.maxK = r.maxK;
      if (r.minHistory !== undefined) s.minHistory = r.minHistory;
      return finite(setTasteGroupSettings(ctx.db, svc().world().ds, s));
    },
    'audience.name': (r) => {
      const ds = svc().world().ds;
      return finite('remove' in r ? forgetTasteGroupName(ctx.db, ds, r.remove) : nameTasteGroup(ctx.db, ds, r.group, r.name));
    },
  };
}
