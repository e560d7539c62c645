/**
 * The `curbfit` command line's entry point: `deno task curbfit COMMAND [options]` in a checkout
 * (the task grants reading and writing files). See README.md, "Command line".
 *
 * @example
 * ```sh
 * deno run --allow-read --allow-write lib/cli/main.ts sweep --data examples/data/orchard.csv \
 *   --target brix --term legendre:days_since_blossom:12 --folds 8 --seed 7 --rule one-se
 * ```
 *
 * @module
 */
import { runCli } from "./run.ts";

if (import.meta.main) Deno.exit(await runCli(Deno.args));
