import type { CliIo } from './command.ts';
import { main } from './main.ts';

/** The process entry of the command line (bin/shelfwright.js and `npm run cli` land here). */
const io: CliIo = {
  out: (t) => process.stdout.write(t.endsWith('\n') ? t : `${t}\n`),
  err: (t) => process.stderr.write(t.endsWith('\n') ? t : `${t}\n`),
  errIsTty: process.stderr.isTTY === true,
};
main(process.argv.slice(2), io).then(
  (code) => {
    process.exitCode = code;
  },
  (e: unknown) => {
    process.stderr.write(`shelfwright: internal error: ${e instanceof Error ? e.message : String(e)}\n`);
    process.exitCode = 70;
  },
);
