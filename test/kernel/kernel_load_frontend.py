"""jupyter_client (Debian) as a front-end that loads the quietframe kernel: bursts, long loops, many widgets, a kill.

Driven by kernel-load.test.ts with the kernel spec in a private prefix. What is checked comes from
the Jupyter messaging protocol ("Kernel status": every request is bracketed by busy and idle on
iopub, parented to it; "Custom Messages") and messages.md of @jupyter-widgets/schema (protocol
2.1: the kernel answers each front-end update with an echo_update of what it applied, and a
kernel-side change goes to the front-end as an update). No check here measures time.
"""

import json
import os
import signal
import sys
import unittest

from jupyter_client.manager import start_new_kernel

from live_explorer_frontend import EXPLORER_CELL, TIMEOUT, LiveFrontend, comm_msgs, explorer_ids, new_explorer_cell, percent, snapped
from widget_protocol_frontend import KERNEL

BURST = 5000
CELL_MOVES = 1000
EXPLORERS = 50
MOVES_EACH = 100


def update(value):
    return {"method": "update", "state": {"value": value}, "buffer_paths": []}


class KernelLoadTests(unittest.TestCase):
    @classmethod
    def setUpClass(cls):
        cls.km, cls.kc = start_new_kernel(kernel_name="quietframe-ts", startup_timeout=TIMEOUT)
        cls.fe = LiveFrontend(cls.kc)
        reply, msgs, _ = cls.fe.execute(KERNEL + EXPLORER_CELL + new_explorer_cell("w"))
        assert reply["status"] == "ok", (reply, [m["content"] for m in msgs])
        cls.ids = explorer_ids(msgs)

    @classmethod
    def tearDownClass(cls):
        cls.kc.stop_channels()
        cls.km.shutdown_kernel(now=True)

    def kernel_side(self):
        return self.fe.json_out(
            "console.log(JSON.stringify({values: w.values, state: w.state.values, fingerprint: w.state.fingerprint, error: w.error ?? null,"
            f' slider: held("{self.ids["slider"]}").value, chart: held("{self.ids["chart"]}").explorer_state}}))'
        )

    def test_1_burst_of_updates_every_one_answered_in_order(self):
        slider = self.ids["slider"]
        state = self.ids["slider_state"]
        # Off the slider's positions on purpose (+0.05): the kernel snaps each one and says so.
        values = [state["min"] + ((i * 37) % 200) * state["step"] + 0.05 for i in range(BURST - 1)] + [72.3]
        # As fast as the shell socket takes them: nothing is read until all are sent.
        ids = [self.fe.send_nowait("comm_msg", {"comm_id": slider, "data": update(v)}) for v in values]
        by_parent, arrival = self.fe.collect_many(ids)
        for msg_id, value in zip(ids, values):
            msgs = by_parent[msg_id]
            # Messaging spec, "Kernel status": busy first, idle last, for every request.
            self.assertEqual((msgs[0]["msg_type"], msgs[0]["content"]["execution_state"]), ("status", "busy"))
            self.assertEqual((msgs[-1]["msg_type"], msgs[-1]["content"]["execution_state"]), ("status", "idle"))
            # messages.md 2.1: one echo_update with the state as received, then the snapped value as an update.
            slider_msgs = [m for m in comm_msgs(msgs) if m["content"]["comm_id"] == slider]
            methods = [m["content"]["data"]["method"] for m in slider_msgs]
            self.assertEqual(methods, ["echo_update", "update"], msg_id)
            self.assertEqual(slider_msgs[0]["content"]["data"]["state"], {"value": value})
            self.assertAlmostEqual(slider_msgs[1]["content"]["data"]["state"]["value"], snapped(state, value), places=9)
        # Echoes arrive in the order the updates were sent.
        echo_parents = [m["parent_header"]["msg_id"] for m in arrival if m["msg_type"] == "comm_msg" and m["content"]["data"]["method"] == "echo_update"]
        self.assertEqual(echo_parents, ids)
        # The last chart update is for the last value, snapped (72.3 → 72.25 with a 0.25 % step).
        final = snapped(state, 72.3)
        self.assertAlmostEqual(final, 72.25, places=9)
        chart_updates = [m for m in arrival if m["msg_type"] == "comm_msg" and m["content"]["comm_id"] == self.ids["chart"] and m["content"]["data"]["method"] == "update"]
        self.assertGreater(len(chart_updates), 0)
        last_chart = chart_updates[-1]["content"]["data"]["state"]["explorer_state"]
        self.assertAlmostEqual(percent(last_chart["values"]["detector.efficiency"]), final, places=9)
        # ...and sent before the idle of the last request (the recomputation of a burst runs for its newest value).
        self.assertEqual(chart_updates[-1]["parent_header"]["msg_id"], ids[-1])
        # Kernel slider value, values, state, the chart model and what the front-end last received agree.
        k = self.kernel_side()
        self.assertAlmostEqual(k["slider"], final, places=9)
        self.assertEqual(k["values"], k["state"])
        self.assertAlmostEqual(percent(k["values"]["detector.efficiency"]), final, places=9)
        self.assertEqual(k["chart"]["fingerprint"], k["fingerprint"])
        self.assertEqual(last_chart["fingerprint"], k["fingerprint"])
        self.assertIsNone(k["error"])

    def test_2_cell_moving_a_slider_a_thousand_times(self):
        state = self.ids["slider_state"]
        code = f"for (let i = 0; i < {CELL_MOVES}; i++) w.set(\"detector.efficiency\", `${{50 + (i % 200) * 0.25}} %`);\n" + 'console.log("moved", JSON.stringify(w.values));'
        reply, msgs, msg_id = self.fe.execute(code)
        # The cell completes with its output and its idle status (collect() waits for the idle).
        self.assertEqual(reply["status"], "ok", [m["content"] for m in msgs])
        out = "".join(m["content"]["text"] for m in msgs if m["msg_type"] == "stream")
        last = state["min"] + ((CELL_MOVES - 1) % 200) * 0.25
        self.assertIn("moved", out)
        self.assertEqual((msgs[-1]["msg_type"], msgs[-1]["content"]["execution_state"]), ("status", "idle"))
        # Every move reached the front-end: one slider update and one chart update each.
        slider_updates = [m for m in comm_msgs(msgs, "update") if m["content"]["comm_id"] == self.ids["slider"]]
        chart_updates = [m for m in comm_msgs(msgs, "update") if m["content"]["comm_id"] == self.ids["chart"]]
        self.assertEqual(len(slider_updates), CELL_MOVES)
        self.assertEqual(len(chart_updates), CELL_MOVES)
        self.assertAlmostEqual(slider_updates[-1]["content"]["data"]["state"]["value"], last, places=9)
        k = self.kernel_side()
        self.assertAlmostEqual(k["slider"], last, places=9)
        self.assertEqual(k["values"], k["state"])
        self.assertEqual(chart_updates[-1]["content"]["data"]["state"]["explorer_state"]["fingerprint"], k["fingerprint"])

    def test_3_many_explorers_updated_in_one_cell(self):
        code = (
            "const many: any[] = [];\n"
            f"for (let e = 0; e < {EXPLORERS}; e++) {{ const x = nb.explorer(setup, OPTS); await x.show(); many.push(x); }}\n"
            f"for (let i = 0; i < {MOVES_EACH}; i++) for (const x of many) x.set(\"detector.efficiency\", `${{60 + (i % 100) * 0.25}} %`);\n"
            'console.log(JSON.stringify(many.map((x) => [x.values["detector.efficiency"], x.state.values["detector.efficiency"], x.error ?? null])));'
        )
        reply, msgs, _ = self.fe.execute(code)
        self.assertEqual(reply["status"], "ok", [m["content"] for m in msgs])
        self.assertEqual([m for m in msgs if m["msg_type"] == "error"], [])
        out = "".join(m["content"]["text"] for m in msgs if m["msg_type"] == "stream" and m["content"]["name"] == "stdout")
        rows = json.loads(out.strip().splitlines()[-1])
        last = 60 + ((MOVES_EACH - 1) % 100) * 0.25
        self.assertEqual(len(rows), EXPLORERS)
        for shown, computed, error in rows:
            self.assertAlmostEqual(percent(shown), last, places=9)
            self.assertEqual(shown, computed)
            self.assertIsNone(error)
        charts = {m["content"]["comm_id"] for m in msgs if m["msg_type"] == "comm_open" and m["content"]["data"]["state"].get("_model_name") == "QuietframeChartModel"}
        self.assertEqual(len(charts), EXPLORERS)
        chart_updates = [m for m in comm_msgs(msgs, "update") if m["content"]["comm_id"] in charts]
        self.assertEqual(len(chart_updates), EXPLORERS * MOVES_EACH)

    def test_4_kill_during_a_burst_then_restart(self):
        slider = self.ids["slider"]
        ids = [self.fe.send_nowait("comm_msg", {"comm_id": slider, "data": update(50 + (i % 200) * 0.25)}) for i in range(2000)]
        # Wait until the kernel is inside the burst (its first echo arrived), then SIGKILL it.
        while True:
            m = self.kc.get_iopub_msg(timeout=TIMEOUT)
            if m["msg_type"] == "comm_msg" and m["parent_header"].get("msg_id") in ids:
                break
        pid = self.km.provisioner.process.pid
        os.kill(pid, signal.SIGKILL)
        self.km.provisioner.process.wait()
        self.assertFalse(self.km.is_alive())
        self.km.restart_kernel(now=True)
        self.kc.wait_for_ready(timeout=TIMEOUT)
        # The notebook API rebuilds the widget when the cells run again; the next cell works.
        reply, msgs, _ = self.fe.execute(KERNEL + EXPLORER_CELL + new_explorer_cell("w"))
        self.assertEqual(reply["status"], "ok", [m["content"] for m in msgs])
        type(self).ids = explorer_ids(msgs)
        reply, msgs, _ = self.fe.execute('w.set("detector.efficiency", "80 %"); console.log(JSON.stringify(w.values))')
        self.assertEqual(reply["status"], "ok", [m["content"] for m in msgs])
        self.assertEqual([m["content"]["data"]["state"] for m in comm_msgs(msgs, "update") if m["content"]["comm_id"] == self.ids["slider"]], [{"value": 80}])
        # A front-end move on the rebuilt slider is echoed and computed.
        _, msgs = self.fe.comm_msg(self.ids["slider"], update(90))
        self.assertEqual([m["content"]["data"]["state"] for m in comm_msgs(msgs, "echo_update")], [{"value": 90}])
        k = self.kernel_side()
        self.assertEqual(k["values"], k["state"])
        self.assertAlmostEqual(percent(k["state"]["detector.efficiency"]), 90, places=9)

    def test_5_drag_over_every_position_is_never_corrected(self):
        slider = self.ids["slider"]
        state = self.ids["slider_state"]
        steps = round((state["max"] - state["min"]) / state["step"])
        # A drag as a slider sends it: its own positions, min + k·step in its floating point. The kernel reads some
        # of them a few ulps away (63.75 vs "63.75 %" → 63.74999999999999); a slider given such a number snaps it
        # back and sends it again, which would replace the drag's newer value, so no position may be corrected.
        values = [state["min"] + k * state["step"] for k in range(steps, -1, -1)]
        ids = [self.fe.send_nowait("comm_msg", {"comm_id": slider, "data": update(v)}) for v in values]
        by_parent, _ = self.fe.collect_many(ids)
        for msg_id, value in zip(ids, values):
            slider_msgs = [m for m in comm_msgs(by_parent[msg_id]) if m["content"]["comm_id"] == slider]
            # messages.md 2.1: the echo_update of what was applied, and no update (the value needs no correction).
            self.assertEqual([(m["content"]["data"]["method"], m["content"]["data"]["state"]) for m in slider_msgs], [("echo_update", {"value": value})], value)
        k = self.kernel_side()
        self.assertEqual(k["slider"], values[-1])
        self.assertEqual(k["values"], k["state"])
        self.assertAlmostEqual(percent(k["values"]["detector.efficiency"]), values[-1], places=9)
        self.assertIsNone(k["error"])


if __name__ == "__main__":
    result = unittest.main(module=__name__, argv=[sys.argv[0], "-v"], exit=False).result
    print(f"LOAD run={result.testsRun} failures={len(result.failures)} errors={len(result.errors)} skipped={len(result.skipped)}")
    sys.exit(0 if result.wasSuccessful() else 1)
