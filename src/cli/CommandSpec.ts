import type { Argv } from 'yargs';

/** Options every command accepts (see src/cli/main.ts). */
export interface GlobalOptions {
  json: boolean;
  debug: boolean;
  quiet: boolean;
}

/**
 * One datlas command. The module that exports it must stay light (no vega, canvas or
 * arrow at top level) so `datlas --help` is fast: import heavy libraries inside `run`.
 */
export interface CommandSpec<A = Record<string, unknown>> {
  /** yargs command string, e.g. 'ingest <paths..>'. */
  usage: string;
  describe: string;
  /** One example: [command line, what it does]. */
  example: [string, string];
  builder: (y: Argv) => Argv;
  /** Does the work; returns the exit code (0 ok, 1 failure of the work). Throw UserError for clean failures. */
  run: (args: A & GlobalOptions) => Promise<number>;
}
