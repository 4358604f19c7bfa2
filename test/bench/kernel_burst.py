"""Burst throughput and resident memory of the quietframe kernel, with jupyter_client as the front-end.

Usage: python3 kernel_burst.py KERNEL_NAME BURST SEQUENTIAL   (run from the repository root)

Shows a live explorer (the same cell as test/kernel/kernel_load_frontend.py), then
  sequential: SEQUENTIAL slider updates, each sent after the previous one's idle (a slow drag)
  burst:      BURST updates sent as fast as the shell socket takes them, then every idle awaited
and prints one JSON object: seconds of each, iopub messages received, chart recomputations
the burst caused, and the kernel's resident memory (VmRSS, /proc) before and after. The
environment (a private Jupyter prefix) comes from the caller. Nothing here is a test.
"""

import json
import os
import sys
import time

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "kernel"))

from jupyter_client.manager import start_new_kernel  # noqa: E402
from live_explorer_frontend import EXPLORER_CELL, TIMEOUT, LiveFrontend, explorer_ids, new_explorer_cell  # noqa: E402


def resident_bytes(pid):
    with open(f"/proc/{pid}/status") as f:
        for line in f:
            if line.startswith("VmRSS:"):
                return int(line.split()[1]) * 1024
    raise RuntimeError("no VmRSS in /proc status")


def update(value):
    return {"method": "update", "state": {"value": value}, "buffer_paths": []}


def main():
    kernel, burst, sequential = sys.argv[1], int(sys.argv[2]), int(sys.argv[3])
    km, kc = start_new_kernel(kernel_name=kernel, startup_timeout=TIMEOUT)
    try:
        fe = LiveFrontend(kc)
        reply, msgs, _ = fe.execute(EXPLORER_CELL + new_explorer_cell("w"))
        if reply["status"] != "ok":
            raise RuntimeError(f"explorer cell failed: {reply}")
        ids = explorer_ids(msgs)
        state = ids["slider_state"]
        value = lambda i: state["min"] + ((i * 37) % 200) * state["step"] + 0.05  # noqa: E731
        pid = km.provisioner.process.pid
        rss_before = resident_bytes(pid)

        start = time.monotonic()
        for i in range(sequential):
            fe.comm_msg(ids["slider"], update(value(i)))
        sequential_s = time.monotonic() - start

        start = time.monotonic()
        sent = [fe.send_nowait("comm_msg", {"comm_id": ids["slider"], "data": update(value(i))}) for i in range(burst)]
        by_parent, arrival = fe.collect_many(sent)
        burst_s = time.monotonic() - start
        rss_after = resident_bytes(pid)
        recomputations = sum(1 for m in arrival if m["msg_type"] == "comm_msg" and m["content"]["comm_id"] == ids["chart"] and m["content"]["data"]["method"] == "update")
        answered = sum(1 for msgs in by_parent.values() if any(m["msg_type"] == "comm_msg" and m["content"]["data"]["method"] == "echo_update" for m in msgs))
        print(
            json.dumps(
                {
                    "burst": burst,
                    "burstSeconds": burst_s,
                    "burstMessages": len(arrival),
                    "answered": answered,
                    "recomputations": recomputations,
                    "sequential": sequential,
                    "sequentialSeconds": sequential_s,
                    "rssBefore": rss_before,
                    "rssAfter": rss_after,
                }
            )
        )
    finally:
        kc.stop_channels()
        km.shutdown_kernel(now=True)


if __name__ == "__main__":
    main()
