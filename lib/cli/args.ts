/**
 * Reading a command's arguments: `--name VALUE`, `--name=VALUE`, flags, and at most one
 * positional argument. A value may start with a dash (`--lambdas -1` reads `-1` and lets the
 * λ check refuse it). `--` ends the options.
 *
 * @module
 */
import { nearestWord } from "../magic/words.ts";
import type { CommandSpec, OptionSpec } from "./commands.ts";
import { usageError } from "./syntax.ts";

/**
 * A command's arguments after reading.
 *
 * @example
 * ```ts
 * import type { ParsedArgs } from "./args.ts";
 * const seeds = (p: ParsedArgs) => p.values.get("seed") ?? [];
 * ```
 */
export interface ParsedArgs {
  /** The command they were read for. */
  readonly command: CommandSpec;
  /** Values by option name (flags hold one empty string), in the order given. */
  readonly values: ReadonlyMap<string, readonly string[]>;
  /** The positional argument, if any. */
  readonly positional: string | undefined;
  /** `--help` or `-h` was given. */
  readonly help: boolean;
}

/**
 * Reads `argv` (the words after the command name) against the command's options.
 *
 * @throws {CurbfitError} `BAD_OPTION` for an unknown option (with the nearest known name), a
 * missing value, a value outside the option's choices, a repeated single option or an
 * unexpected positional argument.
 *
 * @example
 * ```ts
 * import { commandNamed } from "./commands.ts";
 * import { parseArgs } from "./args.ts";
 * const parsed = parseArgs(commandNamed("sweep")!, ["--data", "a.csv", "--term=column:x", "--term", "column:z"]);
 * console.log(parsed.values.get("term")); // [ "column:x", "column:z" ]
 * ```
 */
export function parseArgs(command: CommandSpec, argv: readonly string[]): ParsedArgs {
  const values = new Map<string, string[]>();
  let positional: string | undefined;
  let help = false;
  let optionsEnded = false;
  for (let i = 0; i < argv.length; i++) {
    const word = argv[i];
    if (optionsEnded || !word.startsWith("-") || word === "-") {
      positional = takePositional(command, positional, word);
      continue;
    }
    if (word === "--") {
      optionsEnded = true;
      continue;
    }
    if (word === "--help" || word === "-h") {
      help = true;
      continue;
    }
    const eq = word.indexOf("=");
    const name = word.slice(2, eq === -1 ? undefined : eq);
    const option = findOption(command, word, name);
    let value: string;
    if (option.value === undefined) {
      if (eq !== -1) {
        throw usageError(
          `--${name}`,
          `--${name} takes no value, but was given one`,
          `Write just --${name}`,
        );
      }
      value = "";
    } else if (eq !== -1) value = word.slice(eq + 1);
    else if (i + 1 < argv.length) value = argv[++i];
    else {
      throw usageError(
        `--${name}`,
        `--${name} needs a value (${option.value}) after it`,
        `Write --${name} ${option.value}`,
      );
    }
    checkChoice(option, value);
    const seen = values.get(name) ?? [];
    if (seen.length > 0 && !option.repeat) {
      throw usageError(
        `--${name}`,
        `--${name} is given twice (${JSON.stringify(seen[0])} and ${JSON.stringify(value)})`,
        `Give --${name} once`,
      );
    }
    values.set(name, [...seen, value]);
  }
  return { command, values, positional, help };
}

function takePositional(command: CommandSpec, already: string | undefined, word: string): string {
  if (command.positional === undefined || already !== undefined) {
    throw usageError(
      command.name,
      `the argument ${JSON.stringify(word)} is not expected here`,
      command.positional === undefined
        ? `Options start with --; run "curbfit help ${command.name}" to list them`
        : `Give one ${command.positional.name}`,
    );
  }
  return word;
}

function findOption(command: CommandSpec, word: string, name: string): OptionSpec {
  const option = word.startsWith("--") ? command.options.find((o) => o.name === name) : undefined;
  if (option !== undefined) return option;
  const near = nearestWord(name.replace(/^-+/, ""), command.options.map((o) => o.name));
  throw usageError(
    word,
    `there is no option ${word.split("=")[0]}`,
    near === undefined
      ? `Run "curbfit help ${command.name}" to list its options`
      : `Did you mean --${near}? Run "curbfit help ${command.name}" to list its options`,
  );
}

function checkChoice(option: OptionSpec, value: string): void {
  if (option.choices === undefined || option.choices.includes(value)) return;
  throw usageError(
    `--${option.name}`,
    `--${option.name} is ${JSON.stringify(value)}, but it must be one of ${
      option.choices.join(", ")
    }`,
    `Write e.g. --${option.name} ${option.choices[0]}`,
  );
}

/**
 * The single value of an option, or undefined when it was not given.
 *
 * @example
 * ```ts
 * import { commandNamed } from "./commands.ts";
 * import { optionValue, parseArgs } from "./args.ts";
 * console.log(optionValue(parseArgs(commandNamed("sweep")!, ["--seed", "7"]), "seed")); // "7"
 * ```
 */
export function optionValue(parsed: ParsedArgs, name: string): string | undefined {
  return parsed.values.get(name)?.[0];
}

/**
 * Every value of a repeatable option (empty when not given).
 *
 * @example
 * ```ts
 * import { commandNamed } from "./commands.ts";
 * import { optionValues, parseArgs } from "./args.ts";
 * console.log(optionValues(parseArgs(commandNamed("sweep")!, []), "term")); // []
 * ```
 */
export function optionValues(parsed: ParsedArgs, name: string): readonly string[] {
  return parsed.values.get(name) ?? [];
}

/**
 * Whether a flag (or any option) was given.
 *
 * @example
 * ```ts
 * import { commandNamed } from "./commands.ts";
 * import { hasOption, parseArgs } from "./args.ts";
 * console.log(hasOption(parseArgs(commandNamed("sweep")!, ["--leave-one-out"]), "leave-one-out")); // true
 * ```
 */
export function hasOption(parsed: ParsedArgs, name: string): boolean {
  return parsed.values.has(name);
}
