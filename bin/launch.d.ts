/** Types of bin/launch.js for the TypeScript that imports it (the bench and the tests). */
export declare const BUILD_INPUTS: readonly string[];
export declare function staleReason(distDir?: string): string | null;
export declare function launch(name: string, source: string): Promise<void>;
