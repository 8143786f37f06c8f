/**
 * The fast planner for horizons too large to solve exactly: a greedy by value under every rule, then local
 * search. Greedy order: pins and locks; then suppliers' floors (min share, commitments) and promoted floors,
 * each filled with its best admissible placement; then every (shelf, week, item) by value, best first. A
 * placement is admissible when it breaks no cap and leaves room for the floors still open (so the greedy
 * never paints itself into a corner it could have seen). Local search then repeats two moves while either
 * improves the objective (objective.ts, the blend of mean and weakest week): replace one item of a
 * shelf-week by the best admissible other, and swap two items of a shelf between two weeks (what moves an
 * item to its seasonal peak, or value to the weakest week, without breaking rest or appearance limits).
 * Typed arrays and counters throughout; every move is checked by the same counters that built the plan.
 */
import { compilePlan, at, type CompiledPlan } from './compile.ts';
import { orderPlan, scorePlan } from './objective.ts';
import type { Plan, PlanInstance, SolveReport } from './types.ts';

export interface HeuristicOptions {
  /** Stop local search after this many sweeps without counting (each sweep tries every move once). */
  maxSweeps?: number;
  /** Stop local search when now() passes this time (ms, from `now`). */
  deadline?: number;
  now?: () => number;
}

class State {
  readonly c: CompiledPlan;
  readonly inst: PlanInstance;
  readonly x: Uint8Array;
  readonly weekCount: Uint8Array;
  readonly apps: Int32Array;
  readonly fill: Int32Array;
  readonly members: Int32Array[];
  readonly groupCount: Int32Array;
  readonly promCount: Int32Array;
  readonly sponCount: Int32Array;
  readonly supCount: Int32Array;
  readonly supFloor: Int32Array;
  readonly weekValue: Float64Array;
  readonly prev: Uint8Array;
  deficit = 0;
  placed = 0;
  /** Placements shared with the previous plan, kept as moves are made. */
  kept = 0;

  constructor(inst: PlanInstance, c: CompiledPlan) {
    this.inst = inst;
    this.c = c;
    const { P, N, S } = c;
    this.x = new Uint8Array(S * N * P);
    this.weekCount = new Uint8Array(N * P);
    this.apps = new Int32Array(P);
    this.fill = new Int32Array(S * N);
    this.members = Array.from({ length: S * N }, (_, k) => new Int32Array(c.sizes[Math.floor(k / N)]!).fill(-1));
    this.groupCount = new Int32Array(c.groups.length * N);
    this.promCount = new Int32Array(S * N);
    this.sponCount = new Int32Array(N);
    const G = inst.ctx.facets.supplier.values.length;
    this.supCount = new Int32Array(G);
    this.supFloor = new Int32Array(G);
    for (const [g, f] of c.supplierFloor) this.supFloor[g] = f;
    for (const f of this.supFloor) this.deficit += f;
    this.weekValue = new Float64Array(N);
    this.prev = new Uint8Array(S * N * P);
    inst.previous?.slots.forEach((weeks, s) => weeks.forEach((list, w) => list.forEach((p) => {
      if (p >= 0 && s < S && w < N && p < P) this.prev[at(c, s, w, p)] = 1;
    })));
  }

  v(s: number, w: number, p: number): number {
    const v = this.inst.value[at(this.c, s, w, p)]!;
    return Number.isNaN(v) ? 0 : v;
  }

  /** Whether (s, w, p) may be added now, leaving room for open floors. */
  canAdd(s: number, w: number, p: number): boolean {
    const c = this.c;
    const { N, P } = c;
    const k = at(c, s, w, p);
    if (!c.eligible[k] || this.x[k] || c.lockedWeek[s * N + w]) return false;
    const size = c.sizes[s]!;
    const f = this.fill[s * N + w]!;
    if (f >= size) return false;
    const wc = this.weekCount[w * P + p]!;
    if (wc > 0 && !c.repeatAllowed) return false;
    if (wc === 0) {
      if (this.apps[p]! >= this.inst.horizon.maxAppearances) return false;
      const r = this.inst.horizon.restWeeks;
      for (let ww = Math.max(0, w - r); ww <= Math.min(N - 1, w + r); ww++) if (ww !== w && this.weekCount[ww * P + p]! > 0) return false;
    }
    for (let q = c.groupPtr[s * P + p]!; q < c.groupPtr[s * P + p + 1]!; q++) {
      const g = c.groupIds[q]!;
      if (this.groupCount[g * N + w]! >= c.groups[g]!.max) return false;
    }
    if (c.promoted[p]) {
      if (this.promCount[s * N + w]! >= c.promotedMax[s]! || this.sponCount[w]! >= c.sponsoredCap) return false;
    } else if (size - f - 1 < c.promotedMin[s]! - this.promCount[s * N + w]!) return false;
    const g = c.supplier[p]!;
    if (this.supCount[g]! >= c.supplierCap) return false;
    const helps = this.supCount[g]! < this.supFloor[g]! ? 1 : 0;
    return c.totalSlots - this.placed - 1 >= this.deficit - helps;
  }

  add(s: number, w: number, p: number): void {
    const c = this.c;
    const { N, P } = c;
    this.x[at(c, s, w, p)] = 1;
    this.kept += this.prev[at(c, s, w, p)]!;
    const cell = s * N + w;
    const list = this.members[cell]!;
    list[list.indexOf(-1)] = p;
    this.fill[cell]!++;
    if (this.weekCount[w * P + p]!++ === 0) this.apps[p]!++;
    for (let q = c.groupPtr[s * P + p]!; q < c.groupPtr[s * P + p + 1]!; q++) this.groupCount[c.groupIds[q]! * N + w]!++;
    if (c.promoted[p]) {
      this.promCount[cell]!++;
      this.sponCount[w]!++;
    }
    const g = c.supplier[p]!;
    if (this.supCount[g]!++ < this.supFloor[g]!) this.deficit--;
    this.placed++;
    this.weekValue[w]! += this.v(s, w, p);
  }

  remove(s: number, w: number, p: number): void {
    const c = this.c;
    const { N, P } = c;
    this.x[at(c, s, w, p)] = 0;
    this.kept -= this.prev[at(c, s, w, p)]!;
    const cell = s * N + w;
    const list = this.members[cell]!;
    list[list.indexOf(p)] = -1;
    this.fill[cell]!--;
    if (--this.weekCount[w * P + p]! === 0) this.apps[p]!--;
    for (let q = c.groupPtr[s * P + p]!; q < c.groupPtr[s * P + p + 1]!; q++) this.groupCount[c.groupIds[q]! * N + w]!--;
    if (c.promoted[p]) {
      this.promCount[cell]!--;
      this.sponCount[w]!--;
    }
    const g = c.supplier[p]!;
    if (--this.supCount[g]! < this.supFloor[g]!) this.deficit++;
    this.placed--;
    this.weekValue[w]! -= this.v(s, w, p);
  }

  /** The objective's parts that moves change: the mean's sum, the weakest week, kept placements. */
  objective(): number {
    const beta = this.inst.objective.minWeekWeight;
    let sum = 0;
    let min = Infinity;
    for (const v of this.weekValue) {
      sum += v;
      if (v < min) min = v;
    }
    return (1 - beta) * (sum / this.c.N) + beta * min + this.inst.objective.keepWeight * this.kept;
  }

  /** Floors that removing p from (s, w) would open: the replacement must then carry them. */
  floorsAfterRemoval(s: number, w: number, p: number): { supplier: number; promoted: boolean } {
    const c = this.c;
    const g = c.supplier[p]!;
    return {
      supplier: this.supCount[g]! <= this.supFloor[g]! ? g : -1,
      promoted: c.promoted[p] === 1 && this.promCount[s * c.N + w]! <= c.promotedMin[s]!,
    };
  }
}

/** Candidates admissible somewhere in cell (s, w), best value first. */
function cellOrders(inst: PlanInstance, c: CompiledPlan): Int32Array[] {
  const out: Int32Array[] = [];
  for (let s = 0; s < c.S; s++) {
    for (let w = 0; w < c.N; w++) {
      const ps: number[] = [];
      for (let p = 0; p < c.P; p++) if (c.eligible[at(c, s, w, p)] && !c.forced[at(c, s, w, p)]) ps.push(p);
      const v = (p: number) => {
        const x = inst.value[at(c, s, w, p)]!;
        return Number.isNaN(x) ? 0 : x;
      };
      ps.sort((a, b) => v(b) - v(a) || a - b);
      out.push(Int32Array.from(ps));
    }
  }
  return out;
}

export function solveHeuristic(inst: PlanInstance, options: HeuristicOptions = {}): SolveReport {
  const now = options.now ?? (() => 0);
  const t0 = now();
  const c = compilePlan(inst);
  const { P, N, S } = c;
  const st = new State(inst, c);
  const beta = inst.objective.minWeekWeight;
  const keep = inst.objective.keepWeight;
  for (let k = 0; k < c.forced.length; k++) {
    if (!c.forced[k]) continue;
    const p = k % P;
    const sw = (k - p) / P;
    st.add(Math.floor(sw / N), sw % N, p);
  }
  const orders = cellOrders(inst, c);
  // Effective worth of a placement in the mean: value share plus the keep bonus.
  const worth = (s: number, w: number, p: number) => ((1 - beta) / N) * st.v(s, w, p) + (st.prev[at(c, s, w, p)] ? keep : 0);
  /** Best admissible placement of cell (s, w) satisfying `ok`, or -1. */
  const bestIn = (s: number, w: number, ok: (p: number) => boolean): number => {
    let best = -1;
    let bestWorth = -Infinity;
    for (const p of orders[s * N + w]!) {
      if (((1 - beta) / N) * st.v(s, w, p) + keep < bestWorth) break;
      if (!ok(p) || !st.canAdd(s, w, p)) continue;
      const x = worth(s, w, p);
      if (x > bestWorth) {
        bestWorth = x;
        best = p;
      }
    }
    return best;
  };
  // Floors first: suppliers' (min share, commitments), then promoted per shelf-week.
  for (let g = 0; g < st.supFloor.length; g++) {
    while (st.supCount[g]! < st.supFloor[g]!) {
      let pick: [number, number, number] | null = null;
      let pickWorth = -Infinity;
      for (let s = 0; s < S; s++) {
        for (let w = 0; w < N; w++) {
          const p = bestIn(s, w, (q) => c.supplier[q] === g);
          if (p >= 0 && worth(s, w, p) > pickWorth) {
            pickWorth = worth(s, w, p);
            pick = [s, w, p];
          }
        }
      }
      if (!pick) break;
      st.add(...pick);
    }
  }
  for (let s = 0; s < S; s++) {
    for (let w = 0; w < N; w++) {
      while (st.promCount[s * N + w]! < c.promotedMin[s]! && !c.lockedWeek[s * N + w]) {
        const p = bestIn(s, w, (q) => c.promoted[q] === 1);
        if (p < 0) break;
        st.add(s, w, p);
      }
    }
  }
  // Then everything by value, best first.
  const flat: number[] = [];
  for (let s = 0; s < S; s++) for (let w = 0; w < N; w++) for (const p of orders[s * N + w]!) flat.push(at(c, s, w, p));
  const key = (k: number) => {
    const p = k % P;
    const sw = (k - p) / P;
    return worth(Math.floor(sw / N), sw % N, p);
  };
  flat.sort((a, b) => key(b) - key(a) || a - b);
  for (const k of flat) {
    const p = k % P;
    const sw = (k - p) / P;
    const s = Math.floor(sw / N);
    const w = sw % N;
    if (st.fill[sw]! < c.sizes[s]! && st.canAdd(s, w, p)) st.add(s, w, p);
  }

  // Local search.
  const maxSweeps = options.maxSweeps ?? 40;
  let current = st.objective();
  for (let sweep = 0; sweep < maxSweeps; sweep++) {
    if (options.deadline !== undefined && now() > options.deadline) break;
    let improved = false;
    // Move 1: replace one item of a shelf-week by the best admissible other.
    for (let s = 0; s < S; s++) {
      for (let w = 0; w < N; w++) {
        if (c.lockedWeek[s * N + w]) continue;
        const list = st.members[s * N + w]!;
        for (let slot = 0; slot < list.length; slot++) {
          const p = list[slot]!;
          if (p >= 0 && c.forced[at(c, s, w, p)]) continue;
          let need = { supplier: -1, promoted: false };
          if (p >= 0) {
            need = st.floorsAfterRemoval(s, w, p);
            st.remove(s, w, p);
          }
          const q = bestIn(s, w, (r) => r !== p && (need.supplier < 0 || c.supplier[r] === need.supplier) && (!need.promoted || c.promoted[r] === 1));
          if (q >= 0) {
            st.add(s, w, q);
            const next = st.objective();
            if (next > current + 1e-12) {
              current = next;
              improved = true;
              continue;
            }
            st.remove(s, w, q);
          }
          if (p >= 0) st.add(s, w, p);
        }
      }
    }
    // Move 2: swap two items of one shelf between two weeks.
    for (let s = 0; s < S; s++) {
      for (let w1 = 0; w1 < N; w1++) {
        for (let w2 = w1 + 1; w2 < N; w2++) {
          if (c.lockedWeek[s * N + w1] || c.lockedWeek[s * N + w2]) continue;
          const a = st.members[s * N + w1]!;
          const b = st.members[s * N + w2]!;
          for (let i = 0; i < a.length; i++) {
            for (let j = 0; j < b.length; j++) {
              const p = a[i]!;
              const q = b[j]!;
              if (p < 0 || q < 0 || p === q) continue;
              if (c.forced[at(c, s, w1, p)] || c.forced[at(c, s, w2, q)]) continue;
              // Quick bound: the swap must raise the mean or the weaker of the two weeks.
              const d1 = st.v(s, w1, q) - st.v(s, w1, p);
              const d2 = st.v(s, w2, p) - st.v(s, w2, q);
              if (d1 + d2 <= 1e-12 && !(beta > 0 && (d1 > 0 || d2 > 0))) continue;
              if (c.promoted[p] !== c.promoted[q] && (c.promotedMin[s]! > 0 || c.promotedMax[s]! < c.sizes[s]!)) continue;
              st.remove(s, w1, p);
              st.remove(s, w2, q);
              if (st.canAdd(s, w1, q)) {
                st.add(s, w1, q);
                if (st.canAdd(s, w2, p)) {
                  st.add(s, w2, p);
                  const next = st.objective();
                  if (next > current + 1e-12) {
                    current = next;
                    improved = true;
                    continue;
                  }
                  st.remove(s, w2, p);
                }
                st.remove(s, w1, q);
              }
              st.add(s, w1, p);
              st.add(s, w2, q);
            }
          }
        }
      }
    }
    // Move 3 (an ejection chain of length two): item q leaves its cell (s2, w2) for cell (s, w) in place of p,
    // and (s2, w2) takes its best admissible item. What moves an item whose rest or appearance limit
    // blocks every simple replacement.
    for (let s2 = 0; s2 < S; s2++) {
      for (let w2 = 0; w2 < N; w2++) {
        if (c.lockedWeek[s2 * N + w2]) continue;
        const from = st.members[s2 * N + w2]!;
        for (let i = 0; i < from.length; i++) {
          const q = from[i]!;
          if (q < 0 || c.forced[at(c, s2, w2, q)]) continue;
          for (let s = 0; s < S; s++) {
            for (let w = 0; w < N; w++) {
              if ((s === s2 && w === w2) || c.lockedWeek[s * N + w] || !c.eligible[at(c, s, w, q)]) continue;
              const to = st.members[s * N + w]!;
              for (let j = 0; j < to.length; j++) {
                const p = to[j]!;
                if (p < 0 || p === q || c.forced[at(c, s, w, p)] || !(st.v(s, w, q) > st.v(s, w, p))) continue;
                if (st.x[at(c, s2, w2, q)] !== 1 || st.x[at(c, s, w, p)] !== 1) continue;
                const needP = st.floorsAfterRemoval(s, w, p);
                st.remove(s, w, p);
                const needQ = st.floorsAfterRemoval(s2, w2, q);
                st.remove(s2, w2, q);
                const okHere = (needP.supplier < 0 || c.supplier[q] === needP.supplier) && (!needP.promoted || c.promoted[q] === 1);
                if (okHere && st.canAdd(s, w, q)) {
                  st.add(s, w, q);
                  const r = bestIn(s2, w2, (x) => x !== q && (needQ.supplier < 0 || c.supplier[x] === needQ.supplier) && (!needQ.promoted || c.promoted[x] === 1));
                  if (r >= 0) {
                    st.add(s2, w2, r);
                    const next = st.objective();
                    if (next > current + 1e-12) {
                      current = next;
                      improved = true;
                      break;
                    }
                    st.remove(s2, w2, r);
                  }
                  st.remove(s, w, q);
                }
                st.add(s2, w2, q);
                st.add(s, w, p);
              }
              if (st.x[at(c, s2, w2, q)] !== 1) break;
            }
            if (st.x[at(c, s2, w2, q)] !== 1) break;
          }
        }
      }
    }
    if (!improved) break;
  }
  const plan: Plan = { slots: [] };
  for (let s = 0; s < S; s++) plan.slots.push(Array.from({ length: N }, (_, w) => Int32Array.from(st.members[s * N + w]!)));
  const ordered = orderPlan(inst, plan);
  // A locked week with empty slots keeps them: those slots are not the heuristic's to fill.
  let expected = c.totalSlots;
  for (const l of inst.edits.locks) expected -= c.sizes[l.shelf]! - l.items.length;
  const full = st.placed === expected && st.deficit === 0;
  return { plan: ordered, method: 'heuristic', status: full ? 'feasible' : 'infeasible', objective: scorePlan(inst, ordered).objective, ms: now() - t0 };
}
