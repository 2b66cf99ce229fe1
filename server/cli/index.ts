import { fileURLToPath } from 'node:url';
import { EXIT_USAGE, UsageError } from './options';
import { EXIT_OUTPUT_CLOSED, OutputClosed, printError } from './output';

/**
 * The `pointfold` command line: `npm run --silent pointfold -- <command> …` (DESIGN.md, "The
 * command line"). Each command's module is loaded only when used, so `snap`, `perceive` and
 * `ladder` start without the server, the database layer or the queue. `npm run pointfold` starts
 * it through server/cli/launch.mjs (a cached bundle of this file); `tsx server/cli/index.ts`
 * runs it directly.
 */

const HELP = `Usage: pointfold <command> [options]

Commands:
  snap FILE...       perceive, snap onto exact symmetry, orient, report (and write files)
  perceive FILE...   perceive point groups without changing the structures
  ladder FILE...     the groups perceived across tolerances 1e-4 to 0.3 Å, with snap costs
  submit FILE...     upload a batch to a Pointfold server, wait, download the cleaned files
  token create       print a new API token for a user (operator command, local database)

Run pointfold <command> --help for the options of each.
Exit status: 0 done; 1 bad input (the other structures are still processed); 2 usage error.`;

type Runner = (argv: string[]) => Promise<number>;

const COMMANDS: Record<string, () => Promise<Runner>> = {
  snap: async () => (await import('./snap-command')).runSnap,
  perceive: async () => (await import('./perceive-command')).runPerceive,
  ladder: async () => (await import('./perceive-command')).runLadder,
  submit: async () => (await import('./submit')).run,
  token: async () => (await import('./token')).run,
};

/** Run the CLI with `argv` (without node and the script). Returns the exit status. */
export async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv;
  if (command == null || command === '--help' || command === '-h' || command === 'help') {
    process.stdout.write(`${HELP}\n`);
    return command == null ? EXIT_USAGE : 0;
  }
  const load = COMMANDS[command];
  if (load == null) {
    printError(`pointfold: unknown command '${command}' (commands: ${Object.keys(COMMANDS).join(', ')}; see pointfold --help)`);
    return EXIT_USAGE;
  }
  try {
    return await (await load())(rest);
  } catch (e) {
    if (e instanceof UsageError) {
      printError(e.message);
      return EXIT_USAGE;
    }
    throw e;
  }
}

/**
 * What a `pointfold` process does: run `main(argv)` and set the exit status — 70 (EX_SOFTWARE)
 * with the stack on stderr when something throws, since that is a bug of ours, not bad input;
 * 141 without a word when the reader of stdout has gone (OutputClosed).
 * Called by server/cli/launch.mjs and when this file is run directly.
 */
export async function runCommandLine(argv: string[]): Promise<number> {
  let code: number;
  try {
    // `npm run` starts scripts in the package root; paths on the command line are meant relative
    // to where the user typed them, which npm passes as INIT_CWD.
    if (process.env.npm_lifecycle_event === 'pointfold' && process.env.INIT_CWD) process.chdir(process.env.INIT_CWD);
    code = await main(argv);
  } catch (e) {
    if (e instanceof OutputClosed) code = EXIT_OUTPUT_CLOSED;
    else {
      process.stderr.write(`pointfold: internal error: ${(e as Error)?.stack ?? String(e)}\n`);
      code = 70;
    }
  }
  process.exitCode = code;
  return code;
}

if (process.argv[1] != null && fileURLToPath(import.meta.url) === process.argv[1]) {
  void runCommandLine(process.argv.slice(2));
}
