/**
 * `deno task new-notebook <folder>`: scaffolds an analysis folder (see scaffold.ts). A relative
 * folder is taken from the directory the task was started in (`INIT_CWD`, set by `deno task`).
 *
 * Exit codes: 0 created; 2 bad usage or a folder that is not empty.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { commandRunner, installedSpec, KERNEL_NAME } from "./jupyter.ts";
import { scaffoldFiles, writeScaffold } from "./scaffold.ts";

/** The checkout this file belongs to (two folders up). */
const ROOT = new URL("../../", import.meta.url);

/**
 * An absolute path for `folder`, relative ones taken from `base`.
 *
 * @example
 * ```ts
 * import { resolveFolder } from "./new_notebook.ts";
 * console.log(resolveFolder("kiln", "/home/me")); // /home/me/kiln
 * ```
 */
export function resolveFolder(folder: string, base: string): string {
  const joined = folder.startsWith("/") ? folder : `${base.replace(/\/+$/, "")}/${folder}`;
  const parts: string[] = [];
  for (const part of joined.split("/")) {
    if (part === "" || part === ".") continue;
    if (part === "..") parts.pop();
    else parts.push(part);
  }
  return `/${parts.join("/")}`;
}

/**
 * Scaffolds the folder named by `args`, writing what it did to `print`; returns the exit code.
 *
 * @example
 * ```ts
 * import { newNotebook } from "./new_notebook.ts";
 * const code = await newNotebook([await Deno.makeTempDir() + "/kiln"], Deno.cwd(), console.log);
 * ```
 */
export async function newNotebook(
  args: readonly string[],
  base: string,
  print: (line: string) => void,
): Promise<number> {
  if (args.length !== 1 || args[0].startsWith("-")) {
    print("Usage: deno task new-notebook <folder>   (the folder must be new or empty)");
    return 2;
  }
  const folder = resolveFolder(args[0], base);
  const root = decodeURIComponent(ROOT.pathname).replace(/\/$/, "");
  const config = JSON.parse(await Deno.readTextFile(new URL("deno.json", ROOT)));
  try {
    await writeScaffold(folder, scaffoldFiles({ folder, root, imports: config.imports ?? {} }));
  } catch (e) {
    if (e instanceof CurbfitError && e.code === "FOLDER_NOT_EMPTY") {
      print(`error: ${e.message}`);
      return 2;
    }
    throw e;
  }
  print(`Created ${folder}: deno.json, analysis.ipynb, README.md, .gitignore`);
  print(`Open ${folder}/analysis.ipynb in JupyterLab or VS Code.`);
  if (await installedSpec(commandRunner(), KERNEL_NAME) === undefined) {
    print(`The kernel "${KERNEL_NAME}" is not installed yet: run \`deno task kernel\` once.`);
  }
  return 0;
}

if (import.meta.main) {
  const base = Deno.env.get("INIT_CWD") ?? Deno.cwd();
  Deno.exit(await newNotebook(Deno.args, base, console.log));
}
