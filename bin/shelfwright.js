#!/usr/bin/env node
// The `shelfwright` command: the built command line (dist-node/cli.js) when it is up to date, else the
// TypeScript source through tsx (bin/launch.js says which and why).
import { launch } from './launch.js';

await launch('cli', 'src-main/shell/cli/run.ts');
