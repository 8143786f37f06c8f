import type { StateCreator } from 'zustand';
import type { RequestOf, ResponseOf } from '../../src-main/api/contract.ts';
import type { SplitChoice } from '../../src-main/core/eval/split-choice.ts';
import { describeError, type Client } from '../client/client.ts';
import type { AppState } from './store.ts';

export type JobState = ResponseOf<'job.status'>;
export type ModelInfo = ResponseOf<'models.list'>['models'][number];
export type HybridInfo = ResponseOf<'models.list'>['hybrid'];
export type OfflineEvaluation = NonNullable<ResponseOf<'evaluate.latest'>['evaluation']>;
export type TrainRequest = RequestOf<'train.start'>;

export interface ModelsSlice {
  models: {
    list: ModelInfo[];
    /** The validated blend stored with the models (null before the first training that learned one). */
    hybrid: HybridInfo;
    /** The training or evaluation job being watched, as last polled. */
    job: JobState | null;
    evaluation: OfflineEvaluation | null;
    errors: { list?: string; train?: string; evaluate?: string };
  };
  loadModels(): Promise<void>;
  startTraining(req?: TrainRequest): Promise<void>;
  /** `split` left out: the api's 'auto' (by time when the signals have times, else per customer at random). */
  startEvaluation(k: number, split?: SplitChoice): Promise<void>;
  cancelJob(): Promise<void>;
}

/** How often a running job is polled: often enough for a smooth bar, rare enough to cost nothing. */
export const POLL_MS = 250;

export function createModelsSlice(client: Client, sleep: (ms: number) => Promise<void>): StateCreator<AppState, [], [], ModelsSlice> {
  return (set, get) => {
    const put = (p: Partial<ModelsSlice['models']>) => set((s) => ({ models: { ...s.models, ...p } }));
    const setError = (area: keyof ModelsSlice['models']['errors'], msg: string | undefined) =>
      set((s) => {
        const errors = { ...s.models.errors };
        if (msg === undefined) delete errors[area];
        else errors[area] = msg;
        return { models: { ...s.models, errors } };
      });

    /** Polls until the job ends, then re-reads what it changed. Same polling over IPC and HTTP. */
    const watch = async (job: JobState, area: 'train' | 'evaluate') => {
      put({ job });
      let current = job;
      while (current.state === 'running') {
        await sleep(POLL_MS);
        try {
          current = await client.call('job.status', { id: current.id });
        } catch (e) {
          setError(area, describeError(e));
          return;
        }
        if (get().models.job?.id !== current.id) return; // another job took over the screen
        put({ job: current });
      }
      if (current.state === 'failed') setError(area, `${current.error ?? 'the job failed'}. Check the data on the Overview screen, then try again.`);
      await get().loadModels();
    };

    return {
      models: { list: [], hybrid: null, job: null, evaluation: null, errors: {} },
      async loadModels() {
        try {
          const [{ models, hybrid }, { evaluation }] = await Promise.all([client.call('models.list', {}), client.call('evaluate.latest', {})]);
          put({ list: models, hybrid, evaluation });
          setError('list', undefined);
        } catch (e) {
          setError('list', describeError(e));
        }
      },
      async startTraining(req = {}) {
        setError('train', undefined);
        try {
          await watch(await client.call('train.start', req), 'train');
        } catch (e) {
          setError('train', describeError(e));
        }
      },
      async startEvaluation(k, split) {
        setError('evaluate', undefined);
        try {
          await watch(await client.call('evaluate.start', { k, ...(split && { split }) }), 'evaluate');
        } catch (e) {
          setError('evaluate', describeError(e));
        }
      },
      async cancelJob() {
        const job = get().models.job;
        if (!job || job.state !== 'running') return;
        try {
          put({ job: await client.call('job.cancel', { id: job.id }) });
        } catch (e) {
          setError(job.kind === 'train' ? 'train' : 'evaluate', describeError(e));
        }
      },
    };
  };
}
