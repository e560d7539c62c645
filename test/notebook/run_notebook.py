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

Deno's kernel (seen with 2.9.6, in about 4 of 100 executions) sometimes publishes a cell's
"idle" status a few milliseconds before that cell's display_data or execute_result. nbclient
stops reading a cell's messages at "idle", so the output would be lost at random. The runner
therefore holds each "idle" message until the IOPub channel has been quiet for
LATE_OUTPUT_GRACE_SECONDS, delivering the late outputs first.
"""

import os
import sys
from queue import Empty

NOT_READY = 3
LATE_OUTPUT_GRACE_SECONDS = 0.5


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


def is_idle(msg):
    return msg["msg_type"] == "status" and msg["content"].get("execution_state") == "idle"


def hold_idle_until_quiet(channel, grace):
    """Make channel.get_msg, on an "idle" status, first read whatever arrives until the
    channel has been quiet for `grace` seconds, then deliver that batch with every "idle"
    status moved behind the other messages (see the module notes). No request is sent while
    nbclient waits for a cell, so a batch never mixes two cells' outputs."""
    from nbclient.util import ensure_async

    original = channel.get_msg
    held = []

    async def get_msg(timeout=None):
        if held:
            return held.pop(0)
        msg = await ensure_async(original(timeout=timeout))
        if not is_idle(msg):
            return msg
        batch = [msg]
        while True:
            try:
                batch.append(await ensure_async(original(timeout=grace)))
            except Empty:
                break
        held.extend([m for m in batch if not is_idle(m)] + [m for m in batch if is_idle(m)])
        return held.pop(0)

    channel.get_msg = get_msg


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
    client.on_notebook_start = lambda notebook: hold_idle_until_quiet(
        client.kc.iopub_channel, LATE_OUTPUT_GRACE_SECONDS
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
