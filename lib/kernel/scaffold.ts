/**
 * A new analysis folder: `deno.json` (import map), `analysis.ipynb` (starter notebook),
 * `README.md` (a stub with the cautions) and `.gitignore`.
 *
 * The folder's deno.json maps the import name "curbfit" to this checkout's mod.ts: by a
 * relative path when the folder lies inside the checkout (both move together), else by an
 * absolute file: URL (the folder can live anywhere on this machine; if the checkout moves,
 * edit that one line). A notebook's Deno kernel reads only the deno.json of its own folder, so
 * the library's own npm imports (pinned versions) are copied next to it.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { CAUTIONS, starterNotebook } from "./starter.ts";

/** Where the files of a new folder come from. */
export interface ScaffoldSource {
  /** Absolute path of the new folder. */
  readonly folder: string;
  /** Absolute path of this checkout (the folder that holds mod.ts and deno.json). */
  readonly root: string;
  /** The checkout's deno.json "imports" (npm packages the library needs). */
  readonly imports: Readonly<Record<string, string>>;
}

/**
 * The import-map target for "curbfit": a relative path from inside the checkout, else a file
 * URL.
 *
 * @example
 * ```ts
 * import { moduleTarget } from "./scaffold.ts";
 * console.log(moduleTarget("/work/main/analyses/kiln", "/work/main")); // ../../mod.ts
 * console.log(moduleTarget("/home/me/kiln", "/work/main")); // file:///work/main/mod.ts
 * ```
 */
export function moduleTarget(folder: string, root: string): string {
  const rootPath = root.replace(/\/+$/, "");
  if (folder === rootPath || folder.startsWith(`${rootPath}/`)) {
    const depth = folder.slice(rootPath.length).split("/").filter((p) => p !== "").length;
    return `${depth === 0 ? "./" : "../".repeat(depth)}mod.ts`;
  }
  const url = new URL("file:///");
  url.pathname = `${rootPath}/mod.ts`;
  return url.href;
}

/**
 * The files of a new analysis folder, name → content.
 *
 * @example
 * ```ts
 * import { scaffoldFiles } from "./scaffold.ts";
 * const files = scaffoldFiles({ folder: "/tmp/kiln", root: "/work/main", imports: {} });
 * console.log(Object.keys(files)); // [ "deno.json", "analysis.ipynb", "README.md", ".gitignore" ]
 * ```
 */
export function scaffoldFiles(source: ScaffoldSource): Record<string, string> {
  const name = source.folder.split("/").filter((p) => p !== "").pop() ?? "analysis";
  const target = moduleTarget(source.folder, source.root);
  const imports: Record<string, string> = { curbfit: target };
  for (const [key, value] of Object.entries(source.imports)) {
    if (key !== "curbfit") imports[key] = value;
  }
  return {
    "deno.json": JSON.stringify({ imports }, null, 2) + "\n",
    "analysis.ipynb": JSON.stringify(starterNotebook(name), null, 1) + "\n",
    "README.md": readme(name, target),
    ".gitignore": [".ipynb_checkpoints/", "node_modules/", ".DS_Store", ""].join("\n"),
  };
}

function readme(name: string, target: string): string {
  return [
    `# ${name}`,
    "",
    "Analysis folder made by `deno task new-notebook`. Open `analysis.ipynb` in JupyterLab or",
    'VS Code and pick the kernel "Deno (curbfit)" (installed once by `deno task kernel` in the',
    "curbfit checkout).",
    "",
    "## Question",
    "",
    "What is being predicted, for whom, and what decision depends on it.",
    "",
    "## Data",
    "",
    "Source, date, how it was collected; rows kept and dropped, and why.",
    "",
    "## Model choice",
    "",
    "Terms, penalty and γ, λ grid, folds and seed, the rule that picked λ, and the chosen λ with",
    "its cross-validation error ± SE.",
    "",
    "## Cautions",
    "",
    ...CAUTIONS,
    "",
    "## Set-up",
    "",
    `\`deno.json\` maps the import name "curbfit" to \`${target}\`. If the curbfit checkout`,
    "moves, change that line. It also lists the npm packages curbfit needs, at the versions",
    "curbfit pins; `deno.lock` (created on first run) records what was used.",
    "",
  ].join("\n");
}

/**
 * Writes the files into `folder`, creating it; refuses a folder that exists and is not empty.
 *
 * @throws {CurbfitError} `FOLDER_NOT_EMPTY` when the folder already holds files.
 *
 * @example
 * ```ts
 * import { scaffoldFiles, writeScaffold } from "./scaffold.ts";
 * const folder = await Deno.makeTempDir();
 * await writeScaffold(folder, scaffoldFiles({ folder, root: "/work/main", imports: {} }));
 * ```
 */
export async function writeScaffold(
  folder: string,
  files: Readonly<Record<string, string>>,
): Promise<void> {
  const info = await Deno.stat(folder).catch((e) => {
    if (e instanceof Deno.errors.NotFound) return undefined;
    throw e;
  });
  const occupied = info !== undefined &&
    (!info.isDirectory || !(await Deno.readDir(folder)[Symbol.asyncIterator]().next()).done);
  if (occupied) {
    throw new CurbfitError(
      "FOLDER_NOT_EMPTY",
      `the folder ${info.isDirectory ? "already holds files" : "is a file"}, and new-notebook ` +
        "never overwrites anything",
      "Name a new or empty folder",
      { source: folder },
    );
  }
  await Deno.mkdir(folder, { recursive: true });
  for (const [name, content] of Object.entries(files)) {
    await Deno.writeTextFile(`${folder}/${name}`, content, { createNew: true });
  }
}
