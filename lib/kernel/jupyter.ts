/**
 * Facts about the local Jupyter installation and curbfit's kernel spec, for the
 * `deno task kernel` and `deno task new-notebook` commands. Commands are run through a
 * `CommandRunner` so tests can run them with another PATH or data folder.
 *
 * @module
 */

/** The kernel spec name curbfit installs (Deno's own kernel under our name). */
export const KERNEL_NAME = "curbfit";

/** The name front ends show in their kernel pickers. */
export const KERNEL_DISPLAY_NAME = "Deno (curbfit)";

/** Debian packages that give Jupyter's client, kernel machinery and the classic front end. */
export const DEBIAN_PACKAGES =
  "python3-nbclient python3-nbformat jupyter-client python3-ipykernel jupyter-notebook";

/**
 * What to do when Jupyter is missing: both ways of installing it.
 *
 * @example
 * ```ts
 * import { INSTALL_ADVICE } from "./jupyter.ts";
 * console.log(INSTALL_ADVICE);
 * ```
 */
export const INSTALL_ADVICE = [
  "Install Jupyter one of these two ways, then run `deno task kernel` again:",
  `  Debian or Ubuntu:  sudo apt-get install ${DEBIAN_PACKAGES}`,
  "  with pip:          pip install jupyterlab",
  "VS Code needs its Jupyter extension as well; it finds the kernel in the same place.",
].join("\n");

/** A finished command: exit code and its output as text. */
export interface CommandResult {
  readonly code: number;
  readonly stdout: string;
  readonly stderr: string;
}

/** Runs a program with arguments; a missing program gives code 127. */
export type CommandRunner = (command: string, args: readonly string[]) => Promise<CommandResult>;

/**
 * Runs commands with `Deno.Command`, optionally with extra environment variables.
 *
 * @example
 * ```ts
 * import { commandRunner } from "./jupyter.ts";
 * const run = commandRunner();
 * const r = await run("jupyter", ["--version"]);
 * console.log(r.code === 0 ? "Jupyter found" : "no Jupyter");
 * ```
 */
export function commandRunner(env: Record<string, string> = {}): CommandRunner {
  return async (command, args) => {
    try {
      const out = await new Deno.Command(command, { args: [...args], env, stdin: "null" })
        .output();
      const text = (b: Uint8Array) => new TextDecoder().decode(b).trim();
      return { code: out.code, stdout: text(out.stdout), stderr: text(out.stderr) };
    } catch (e) {
      if (e instanceof Deno.errors.NotFound) {
        return { code: 127, stdout: "", stderr: `${command}: command not found` };
      }
      throw e;
    }
  };
}

/** What was found of Jupyter. */
export interface JupyterFacts {
  /** `jupyter` runs and its kernel-spec tool works. */
  readonly ready: boolean;
  /** Why not, in a sentence, when not ready. */
  readonly problem?: string;
  /** Front ends found: "JupyterLab", "Notebook". */
  readonly frontEnds: readonly string[];
}

/**
 * Checks for the `jupyter` command, its kernel-spec tool, and the JupyterLab / Notebook front
 * ends (as `jupyter --version` lists them).
 *
 * @example
 * ```ts
 * import { commandRunner, findJupyter } from "./jupyter.ts";
 * const facts = await findJupyter(commandRunner());
 * console.log(facts.ready, facts.frontEnds);
 * ```
 */
export async function findJupyter(run: CommandRunner): Promise<JupyterFacts> {
  const core = await run("jupyter", ["--version"]);
  if (core.code !== 0) {
    return {
      ready: false,
      problem: core.code === 127
        ? "Jupyter was not found (there is no `jupyter` command on PATH)"
        : `\`jupyter --version\` failed: ${firstLine(core.stderr || core.stdout)}`,
      frontEnds: [],
    };
  }
  const frontEnds = frontEndsIn(core.stdout);
  const specs = await run("jupyter", ["kernelspec", "list", "--json"]);
  if (specs.code !== 0) {
    return {
      ready: false,
      problem: "Jupyter is installed without its kernel-spec tool (`jupyter kernelspec` failed; " +
        "it comes with jupyter-client)",
      frontEnds,
    };
  }
  return { ready: true, frontEnds };
}

/**
 * Front ends listed with a version by `jupyter --version` (which prints one
 * "package : version" line per core package, or "not installed").
 *
 * @example
 * ```ts
 * import { frontEndsIn } from "./jupyter.ts";
 * console.log(frontEndsIn("jupyterlab       : 4.1.0\nnotebook         : not installed")); // [ "JupyterLab" ]
 * ```
 */
export function frontEndsIn(versions: string): string[] {
  const found: string[] = [];
  for (const [label, name] of [["JupyterLab", "jupyterlab"], ["Notebook", "notebook"]]) {
    const line = versions.split("\n").find((l) => l.split(":")[0].trim() === name);
    if (line !== undefined && !/not installed/.test(line)) found.push(label);
  }
  return found;
}

/** A kernel spec as `jupyter kernelspec list --json` reports it. */
export interface InstalledSpec {
  readonly resourceDir: string;
  readonly argv: readonly string[];
  readonly displayName: string;
}

/**
 * The kernel spec named `name`, or undefined when Jupyter does not list it.
 *
 * @example
 * ```ts
 * import { commandRunner, installedSpec, KERNEL_NAME } from "./jupyter.ts";
 * const spec = await installedSpec(commandRunner(), KERNEL_NAME);
 * console.log(spec?.displayName ?? "not installed");
 * ```
 */
export async function installedSpec(
  run: CommandRunner,
  name: string,
): Promise<InstalledSpec | undefined> {
  const out = await run("jupyter", ["kernelspec", "list", "--json"]);
  if (out.code !== 0) return undefined;
  try {
    const entry = JSON.parse(out.stdout).kernelspecs?.[name];
    if (entry === undefined) return undefined;
    return {
      resourceDir: String(entry.resource_dir),
      argv: (entry.spec?.argv ?? []).map(String),
      displayName: String(entry.spec?.display_name ?? ""),
    };
  } catch {
    return undefined;
  }
}

/**
 * Installs (or, with `--force`, refreshes) Deno's kernel spec under curbfit's name, using the
 * given Deno binary: `deno jupyter --install --force --name curbfit --display "Deno (curbfit)"`.
 *
 * @example
 * ```ts
 * import { commandRunner, installKernelSpec } from "./jupyter.ts";
 * const result = await installKernelSpec(commandRunner(), Deno.execPath());
 * console.log(result.code === 0 ? "installed" : result.stderr);
 * ```
 */
export function installKernelSpec(run: CommandRunner, deno: string): Promise<CommandResult> {
  return run(deno, [
    "jupyter",
    "--install",
    "--force",
    "--name",
    KERNEL_NAME,
    "--display",
    KERNEL_DISPLAY_NAME,
  ]);
}

/**
 * How to pick the kernel in each front end.
 *
 * @example
 * ```ts
 * import { selectionAdvice } from "./jupyter.ts";
 * console.log(selectionAdvice());
 * ```
 */
export function selectionAdvice(): string {
  return [
    `To use it, pick the kernel "${KERNEL_DISPLAY_NAME}":`,
    "  JupyterLab / Notebook: Kernel menu → Change Kernel… → " + KERNEL_DISPLAY_NAME,
    "  VS Code: Select Kernel (top right of the notebook) → Jupyter Kernel… → " +
    KERNEL_DISPLAY_NAME,
    `Notebooks made by \`deno task new-notebook <folder>\` already name it (kernel "${KERNEL_NAME}").`,
  ].join("\n");
}

/** The first non-empty line of a command's output, without ANSI colour codes. */
export function firstLine(text: string): string {
  // deno-lint-ignore no-control-regex
  const plain = text.replace(/\u001b\[[0-9;]*m/g, "");
  return plain.split("\n").map((l) => l.trim()).find((l) => l !== "") ?? "";
}
