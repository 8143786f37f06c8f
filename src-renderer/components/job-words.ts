import type { JobState } from '../state/models-slice.ts';

/**
 * A running job's progress line in words. Training tunes first when the data changed since the last tuning
 * (the api decides: services/tune/train-tuned.ts DEFAULT_TUNE), so the line names the search and its trials
 * apart from the fit and its iterations.
 */
export function jobStageLine(job: JobState): string {
  const p = job.progress;
  const of = p.iteration !== undefined && p.iterations !== undefined ? ` ${p.iteration} of ${p.iterations}` : '';
  if (p.stage === 'tune') return `Tuning: searching ${p.model ?? 'the models'}'s settings on held-out signals${of ? ` · trial${of}` : ''}`;
  if (p.stage === 'fit') return `Training: ${p.model ?? 'the models'}${of ? ` · iteration${of}` : ''}`;
  if (p.stage === 'blend') return 'Training: learning the blend on held-out customers';
  return `${job.kind === 'train' ? 'Training' : job.kind === 'evaluate' ? 'Evaluation' : 'Demo'}: ${p.stage}${p.model ? ` · ${p.model}` : ''}`;
}
