#!/usr/bin/env node
// The `shelfwright` command: runs the TypeScript CLI through tsx's loader, so there is no build step.
import { register } from 'tsx/esm/api';

register();
await import(new URL('../src-main/shell/cli/run.ts', import.meta.url).href);
