import type { StateCreator } from 'zustand';
import type { RequestOf, ResponseOf } from '../../src-main/api/contract.ts';
import { describeError, type Client } from '../client/client.ts';
import type { AppState } from './store.ts';

export type ImportPreview = ResponseOf<'import.preview'>;
export type ImportReport = ResponseOf<'import.run'>;
export type ImportTarget = RequestOf<'import.run'>['target'];
export type SignalKind = NonNullable<RequestOf<'import.run'>['kind']>;
/** How to read the file: columns for fields, and (signals without a kind column) the kind of every row. */
export interface ImportChoices {
  mapping?: Record<string, string>;
  kind?: SignalKind;
}
/** A path on the main side's machine (Electron only), a small file's content, or a big file streamed ahead (`client.upload`). */
export type ImportSource = { file: string } | { fileName: string; content: string } | { upload: string };

export interface ImportSlice {
  importer: {
    preview: ImportPreview | null;
    report: ImportReport | null;
    busy: boolean;
    error: string | null;
  };
  previewImport(source: ImportSource, target: ImportTarget, choices?: ImportChoices): Promise<void>;
  runImport(source: ImportSource, target: ImportTarget, choices: ImportChoices): Promise<void>;
  resetImport(): void;
  /** Streams a big file to the main side; the source to preview and import it by, or null (error shown). */
  stageUpload(file: File): Promise<ImportSource | null>;
  /** Whether this shell can take a streamed file (else a big file is imported by its path). */
  canStageUploads: boolean;
}

export function createImportSlice(client: Client): StateCreator<AppState, [], [], ImportSlice> {
  return (set, get) => {
    const put = (p: Partial<ImportSlice['importer']>) => set((s) => ({ importer: { ...s.importer, ...p } }));
    return {
      importer: { preview: null, report: null, busy: false, error: null },
      async previewImport(source, target, choices = {}) {
        put({ busy: true, error: null, report: null });
        try {
          const preview = await client.call('import.preview', { ...source, target, ...choices });
          put({ preview, busy: false });
        } catch (e) {
          put({ preview: null, busy: false, error: describeError(e) });
        }
      },
      async runImport(source, target, choices) {
        put({ busy: true, error: null });
        try {
          const report = await client.call('import.run', { ...source, target, ...choices });
          put({ report, busy: false });
          if (report.committed && target === 'items') get().forgetPictures(); // pictures may have changed
          // Counts, freshness and model staleness all follow the data.
          await Promise.all([get().loadWorkspace(), get().loadStats()]);
        } catch (e) {
          put({ busy: false, error: describeError(e) });
        }
      },
      resetImport() {
        put({ preview: null, report: null, error: null, busy: false });
      },
      canStageUploads: client.upload !== undefined,
      async stageUpload(file) {
        if (!client.upload) return null;
        put({ busy: true, error: null, preview: null, report: null });
        try {
          const staged = await client.upload(file);
          put({ busy: false });
          return { upload: staged.upload };
        } catch (e) {
          put({ busy: false, error: describeError(e) });
          return null;
        }
      },
    };
  };
}
