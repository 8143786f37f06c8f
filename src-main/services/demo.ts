import fs from 'node:fs';
import { generateDemoShop } from '../../demo-data/generator/index.ts';
import { BugError, CancelledError, InputError, WorkspaceBusyError } from '../core/errors.ts';
import { workspaceInUse } from '../store/in-use.ts';
import { replaceRefusal } from '../store/replaceable.ts';
import { checkpointAndEmptyLog, openWorkspace } from '../store/workspace.ts';
import { describeHolder } from '../store/write-lock.ts';
import { importFile, type ImportReport } from './import.ts';
import { makeTempFolder } from './temp-folders.ts';
import { trainAndSave, type TrainSummary } from './train/train-job.ts';
import { MODEL_KINDS, type TrainedKind, type TrainProgress } from './train/train-models.ts';
import { tuneAndTrain } from './tune/train-tuned.ts';

export interface DemoBuildOptions {
  seed?: number;
  /** Train every model after the import (default true), so the app opens ready to propose. */
  train?: boolean;
  /**
   * Tune before training, as `train` does by default (issue 10 item 5), with this budget in plain fits
   * (default: the tuner's default); false trains the defaults untuned.
   */
  tune?: false | { budget?: number };
  /** Smaller shops for tests: counts of items, customers and signals. */
  size?: { items?: number; customers?: number; signals?: number };
  onStep?: (message: string) => void;
  onTrainProgress?: (p: TrainProgress) => void;
  /** Stops the build at the next step (or inside training); the target file is left as it was. */
  signal?: AbortSignal;
}

export interface DemoBuildReport {
  file: string;
  shop: string;
  imports: ImportReport[];
  training: TrainSummary | null;
  elapsedMs: number;
}

/**
 * The build replaces `file` whole (and a leftover `<file>.building`): only a workspace, or nothing, may be
 * there, never some other file, whoever asks. Exported so a caller can say so before starting a job.
 */
export function checkDemoTarget(file: string): void {
  for (const f of [file, `${file}.building`]) {
    const refusal = replaceRefusal(f);
    if (refusal) throw new InputError(`will not build the demo at ${f}: ${refusal}; choose a new file name`, { file: f });
  }
}

/**
 * Builds the demo workspace from the invented shop in demo-data/: generate the files, import catalogue,
 * customers and signals, train. It is built beside the target as `<file>.building` and moved into place
 * only when complete, so an interrupted build never leaves a half-made workspace where the app looks.
 */
export async function buildDemoWorkspace(file: string, options: DemoBuildOptions = {}): Promise<DemoBuildReport> {
  const started = performance.now();
  checkDemoTarget(file);
  const step = (message: string) => {
    if (options.signal?.aborted) throw new CancelledError('demo build cancelled');
    options.onStep?.(message);
  };
  const building = `${file}.building`;
  // Refused before any work (another build of the same file shows as its `.building` being open) ...
  refuseDemoTarget(file);
  const dir = makeTempFolder('demo');
  removeWorkspaceFiles(building);
  try {
    step('generating the demo shop');
    const summary = await generateDemoShop({ outDir: dir, ...(options.seed !== undefined && { seed: options.seed }), ...options.size });
    const db = openWorkspace(building);
    const imports: ImportReport[] = [];
    let training: TrainSummary | null = null;
    try {
      for (const target of ['items', 'customers', 'signals'] as const) {
        step(`importing ${target}`);
        const report = await importFile(db, { target, file: summary.files[target] });
        if (!report.committed) throw new BugError(`the demo ${target} did not import: ${report.errors[0]?.message ?? ''}`);
        imports.push(report);
      }
      if (options.train ?? true) {
        step('training models');
        if (options.tune === false) {
          training = await trainAndSave(db, building, {}, {
            ...(options.onTrainProgress && { onProgress: options.onTrainProgress }),
            ...(options.signal && { signal: options.signal }),
          });
        } else {
          const budget = options.tune?.budget;
          const onProgress = options.onTrainProgress;
          const r = await tuneAndTrain(
            db,
            building,
            {},
            { when: 'always', ...(budget !== undefined && { budget }) },
            (p) =>
              onProgress?.({
                stage: p.stage === 'tune' ? 'tune' : (p.stage as TrainProgress['stage']),
                fraction: p.fraction,
                ...(MODEL_KINDS.includes(p.model as TrainedKind) && { model: p.model as TrainedKind }),
                ...(p.iteration !== undefined && { iteration: p.iteration }),
                ...(p.iterations !== undefined && { iterations: p.iterations }),
              }),
            options.signal ?? new AbortController().signal,
          );
          training = r.summary;
        }
      }
      step('finishing');
      checkpointAndEmptyLog(db);
    } finally {
      db.close();
    }
    // ... and again at the last moment, since the build takes a while; nothing is awaited from here to the rename.
    refuseInUse(file);
    removeWorkspaceFiles(file);
    fs.renameSync(building, file);
    return { file, shop: summary.shop, imports, training, elapsedMs: performance.now() - started };
  } catch (e) {
    removeWorkspaceFiles(building);
    throw e;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** Builds the demo workspace only when the file does not exist yet (first launch). */
export async function ensureDemoWorkspace(file: string, options: DemoBuildOptions = {}): Promise<DemoBuildReport | null> {
  if (fs.existsSync(file)) return null;
  return buildDemoWorkspace(file, options);
}

/** Refuses (WorkspaceBusyError) a target that another process has open, or that another build is making. */
export function refuseDemoTarget(file: string): void {
  refuseInUse(file);
  refuseInUse(`${file}.building`);
}

/**
 * The demo replaces the whole file: over a workspace another process has open (the app, an import, a
 * training run), that process would go on writing into the replaced file and lose its work. Refuse instead.
 */
function refuseInUse(file: string): void {
  if (!workspaceInUse(file)) return;
  const holder = describeHolder(file);
  throw new WorkspaceBusyError(
    `the workspace ${file} is open in another Shelfwright process${holder ? ` (${holder})` : ' (the app, an import or a training run)'}; ` +
      'demo replaces the whole file, which would lose that process\'s work. Nothing was changed. Close it or let it ' +
      'finish, then run demo again, or build the demo into another file with -w.',
    file,
  );
}

function removeWorkspaceFiles(file: string): void {
  for (const suffix of ['', '-wal', '-shm']) fs.rmSync(`${file}${suffix}`, { force: true });
}
