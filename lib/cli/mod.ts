/**
 * The `curbfit` command line: `sweep`, `compare`, `fit`, `verify` and `report` on CSV files
 * (README.md, "Command line"). `runCli` runs it in-process and returns the exit code: 0 success,
 * 1 `verify` found a mismatch, 2 a usage or input error (one line on stderr), 3 an internal
 * failure.
 *
 * @example
 * ```ts
 * import { runCli } from "./mod.ts";
 * const code = await runCli(["help"]); // prints the commands
 * console.log(code); // 0
 * ```
 *
 * @module
 */
export { type CliIo, EXIT, processIo, runCli } from "./run.ts";
