"""Execute one Jupyter notebook headless with nbclient and save the executed copy.

Used by test/notebook_test.ts. Two modes:

    run_notebook.py --probe KERNEL
        Exit 0 when nbclient, nbformat and jupyter_client import and the kernel spec KERNEL
        is found; otherwise print the reason on one line and exit 3.

    run_notebook.py KERNEL NOTEBOOK OUT_DIR [TIMEOUT_SECONDS]
        Run every cell of NOTEBOOK in kernel KERNEL with the notebook's folder as the working
        directory, keep going past cell errors (the caller inspects the outputs), write the
        executed notebook to OUT_DIR under the same file name, print its path. Exit 0 when the
        notebook ran to the end (even with error outputs), 1 when the kernel died or a cell
        timed out, 2 for bad arguments.

Kernel specs are looked up the usual way, so JUPYTER_PATH can point at a folder that holds
kernels/KERNEL/kernel.json.
"""

import os
import sys

NOT_READY = 3


def probe(kernel_name):
    try:
        import nbclient  # noqa: F401
        import nbformat  # noqa: F401
        from jupyter_client.kernelspec import KernelSpecManager, NoSuchKernel
    except ImportError as e:
        print(f"python {sys.executable} lacks a Jupyter client module: {e}")
        return NOT_READY
    try:
        KernelSpecManager().get_kernel_spec(kernel_name)
    except NoSuchKernel:
        print(f"no Jupyter kernel spec named {kernel_name!r}")
        return NOT_READY
    return 0


def run(kernel_name, notebook_path, out_dir, timeout):
    import nbformat
    from nbclient import NotebookClient
    from nbclient.exceptions import CellTimeoutError, DeadKernelError

    notebook = nbformat.read(notebook_path, as_version=4)
    client = NotebookClient(
        notebook,
        kernel_name=kernel_name,
        timeout=timeout,
        allow_errors=True,
        resources={"metadata": {"path": os.path.dirname(os.path.abspath(notebook_path))}},
    )
    try:
        client.execute()
    except (CellTimeoutError, DeadKernelError) as e:
        print(f"{notebook_path}: {type(e).__name__}: {e}", file=sys.stderr)
        return 1
    out_path = os.path.join(out_dir, os.path.basename(notebook_path))
    nbformat.write(notebook, out_path)
    print(out_path)
    return 0


def main(argv):
    if len(argv) == 2 and argv[0] == "--probe":
        return probe(argv[1])
    if len(argv) in (3, 4):
        timeout = int(argv[3]) if len(argv) == 4 else 300
        return run(argv[0], argv[1], argv[2], timeout)
    print(__doc__, file=sys.stderr)
    return 2


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
