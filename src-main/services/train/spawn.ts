/** One implementation for every layer that starts threads: see ingest/spawn-worker.ts. */
export { spawnWorker } from '../../ingest/spawn-worker.ts';
