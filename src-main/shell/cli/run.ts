import readline from 'node:readline/promises';
import type { CliIo } from './command.ts';
import { main } from './main.ts';

/** The process entry of the command line (bin/shelfwright.js and `npm run cli` land here). */

// A reader that stops early (`shelfwright stats | head`) closes the pipe: that is no error of ours, so stop
// quietly, as Unix tools do, instead of printing a stack trace.
for (const stream of [process.stdout, process.stderr]) {
  stream.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(process.exitCode ?? 0);
    throw e;
  });
}
const io: CliIo = {
  out: (t) => process.stdout.write(t.endsWith('\n') ? t : `${t}\n`),
  err: (t) => process.stderr.write(t.endsWith('\n') ? t : `${t}\n`),
  errIsTty: process.stderr.isTTY === true,
  outIsTty: process.stdout.isTTY === true,
  ...(process.stdin.isTTY === true && process.stderr.isTTY === true && {
    async ask(question: string) {
      const rl = readline.createInterface({ input: process.stdin, output: process.stderr });
      try {
        return await rl.question(question);
      } finally {
        rl.close();
      }
    },
  }),
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
