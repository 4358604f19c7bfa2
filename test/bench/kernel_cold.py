"""Cold start of a notebook widget, timed with jupyter_client (Debian's /usr/bin/python3).

Usage: python3 kernel_cold.py KERNEL_NAME NOTEBOOK_DIR IMPORT_CODE_FILE WIDGET_CODE_FILE

Starts the kernel in NOTEBOOK_DIR (as a notebook server would), runs the import cell, then
the first widget cell, and prints one JSON object with monotonic-clock times in seconds:
  ready    start_kernel() called -> kernel answers kernel_info (wait_for_ready)
  import   the import cell, execute request -> idle
  display  the widget cell, execute request -> display_data carrying the widget's HTML
  idle     the widget cell, execute request -> idle
The environment (a private Jupyter prefix) comes from the caller.
"""
import json
import queue
import sys
import time

from jupyter_client.manager import KernelManager

WIDGET_MARK = 'class="quietframe-explorer"'


def run_cell(kc, code, timeout):
    """Executes code; returns (seconds to the first widget display or None, seconds to idle, error text)."""
    start = time.monotonic()
    msg_id = kc.execute(code)
    shown = None
    error = ""
    deadline = start + timeout
    while True:
        remaining = deadline - time.monotonic()
        if remaining <= 0:
            raise TimeoutError("the cell did not finish in %s s" % timeout)
        try:
            msg = kc.get_iopub_msg(timeout=remaining)
        except queue.Empty:
            continue
        if msg.get("parent_header", {}).get("msg_id") != msg_id:
            continue
        kind = msg["msg_type"]
        content = msg["content"]
        if kind == "display_data" and shown is None and WIDGET_MARK in str(content.get("data", {}).get("text/html", "")):
            shown = time.monotonic() - start
        elif kind == "error":
            error += "%s: %s\n" % (content.get("ename"), content.get("evalue"))
        elif kind == "stream" and content.get("name") == "stderr":
            error += content.get("text", "")
        elif kind == "status" and content.get("execution_state") == "idle":
            return shown, time.monotonic() - start, error


def main():
    kernel_name, cwd, import_file, widget_file = sys.argv[1:5]
    with open(import_file, encoding="utf-8") as f:
        import_code = f.read()
    with open(widget_file, encoding="utf-8") as f:
        widget_code = f.read()
    km = KernelManager(kernel_name=kernel_name)
    t0 = time.monotonic()
    km.start_kernel(cwd=cwd)
    kc = None
    try:
        kc = km.client()
        kc.start_channels()
        kc.wait_for_ready(timeout=120)
        ready = time.monotonic() - t0
        _, import_s, import_err = run_cell(kc, import_code, 240)
        shown, widget_s, widget_err = run_cell(kc, widget_code, 240)
        print(json.dumps({
            "ready": ready,
            "import": import_s,
            "display": shown,
            "idle": widget_s,
            "errors": (import_err + widget_err).strip(),
        }))
    finally:
        if kc is not None:
            kc.stop_channels()
        km.shutdown_kernel(now=False)


if __name__ == "__main__":
    main()
