/**
 * `deno task kernel`: checks that Jupyter is installed (saying how to install it if not),
 * installs or refreshes Deno's kernel spec under curbfit's name, checks that Jupyter now lists
 * it for this Deno binary, and prints how to select it.
 *
 * Exit codes: 0 installed; 1 Jupyter missing or the install failed.
 *
 * @module
 */
import {
  type CommandRunner,
  commandRunner,
  findJupyter,
  firstLine,
  INSTALL_ADVICE,
  installedSpec,
  installKernelSpec,
  KERNEL_DISPLAY_NAME,
  KERNEL_NAME,
  selectionAdvice,
} from "./jupyter.ts";

/**
 * Runs the kernel set-up, writing what it does to `print`; returns the exit code.
 *
 * @example
 * ```ts
 * import { setUpKernel } from "./install.ts";
 * import { commandRunner } from "./jupyter.ts";
 * const code = await setUpKernel(commandRunner(), Deno.execPath(), console.log);
 * ```
 */
export async function setUpKernel(
  run: CommandRunner,
  deno: string,
  print: (line: string) => void,
): Promise<number> {
  const jupyter = await findJupyter(run);
  if (!jupyter.ready) {
    print(`${jupyter.problem}.`);
    print(INSTALL_ADVICE);
    return 1;
  }
  print(
    `Jupyter found; front ends: ${
      jupyter.frontEnds.length > 0 ? jupyter.frontEnds.join(", ") : "none (VS Code works too)"
    }.`,
  );
  const installed = await installKernelSpec(run, deno);
  if (installed.code !== 0) {
    print(`Installing the kernel spec failed: ${firstLine(installed.stderr || installed.stdout)}`);
    return 1;
  }
  const spec = await installedSpec(run, KERNEL_NAME);
  if (spec === undefined || !(await sameFile(spec.argv[0] ?? "", deno))) {
    print(
      `Deno reported success, but Jupyter does not list a kernel "${KERNEL_NAME}" that runs ` +
        `${deno}. Check \`jupyter kernelspec list\` and the JUPYTER_PATH / XDG_DATA_HOME ` +
        "variables.",
    );
    return 1;
  }
  print(`Kernel "${KERNEL_NAME}" (${KERNEL_DISPLAY_NAME}) is installed in ${spec.resourceDir}`);
  print(`It runs ${deno}.`);
  if (jupyter.frontEnds.length === 0) {
    print(
      "No JupyterLab or Notebook front end was found; for one: sudo apt-get install " +
        "jupyter-notebook, or pip install jupyterlab",
    );
  }
  print(selectionAdvice());
  return 0;
}

/** Whether two paths name the same file (after resolving symbolic links). */
async function sameFile(a: string, b: string): Promise<boolean> {
  if (a === b) return true;
  try {
    return await Deno.realPath(a) === await Deno.realPath(b);
  } catch {
    return false;
  }
}

if (import.meta.main) {
  Deno.exit(await setUpKernel(commandRunner(), Deno.execPath(), console.log));
}
