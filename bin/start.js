#!/usr/bin/env node
// `npm start`: the built web shell launcher (dist-node/start.js) when it is up to date, else
// src-main/shell/start.ts through tsx (bin/launch.js says which and why).
import { launch } from './launch.js';

await launch('start', 'src-main/shell/start.ts');
