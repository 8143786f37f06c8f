import { ensureDemoWorkspace, type DemoBuildOptions } from '../../services/demo.ts';

/**
 * Builds the demo workspace on first launch (nothing happens when the file exists), telling the person
 * at the terminal what is going on: it takes under a minute, most of it tuning and training.
 */
export async function ensureDemo(
  file: string,
  log: (line: string) => void = console.log,
  build: (file: string, options: DemoBuildOptions) => Promise<unknown> = ensureDemoWorkspace,
): Promise<void> {
  let lastModel = '';
  await build(file, {
    onStep: (step) => log(`demo workspace: ${step}`),
    onTrainProgress: (p) => {
      if (p.stage === 'tune') {
        if (lastModel !== 'tune') log('demo workspace: tuning the models (searching their settings)');
        lastModel = 'tune';
      } else if (p.model && p.model !== lastModel) log(`demo workspace: training ${(lastModel = p.model)}`);
    },
  });
}
