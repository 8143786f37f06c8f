/**
 * Child process of temp-folders.test.ts: makes a private temp folder under the given parent, says where,
 * and waits to be killed (a run that never reaches its own clean-up).
 * Usage: node --import tsx test/services/temp-child.ts <parent>
 */
import { makeTempFolder } from '../../src-main/services/temp-folders.ts';

const parent = process.argv[2];
if (!parent) throw new Error('usage: temp-child.ts <parent>');
process.stdout.write(`${makeTempFolder('upload', parent)}\n`);
setInterval(() => undefined, 60_000);
