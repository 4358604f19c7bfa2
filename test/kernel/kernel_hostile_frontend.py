"""jupyter_client (Debian) as a hostile front-end of the quietframe kernel.

Driven by kernel-hostile.test.ts with the kernel spec in a private prefix. Each case sends what
a broken or malicious front-end could, then checks that the refusal is bounded, that no widget's
state changed, that nothing reached Object.prototype, and that the kernel answers the next cell.
Sources: the Jupyter messaging protocol ("Custom Messages", "Kernel status", "Comm info") and
messages.md of @jupyter-widgets/schema (protocol 2.1). The limits checked (8 MiB per message,
120 characters per echoed name) are the kernel's own, stated in docs/kernel.md.
"""

import json
import sys
import unittest
import uuid

from jupyter_client.manager import start_new_kernel

from live_explorer_frontend import EXPLORER_CELL, TIMEOUT, LiveFrontend, comm_msgs, explorer_ids, new_explorer_cell
from widget_protocol_frontend import KERNEL

MESSAGE_LIMIT = 8 * 1024 * 1024
HUGE = 10 * 1024 * 1024
LONG = 1024 * 1024
# A refusal (error text and everything around it) stays far below the size of what was sent.
BOUNDED = 4000


def update(state, buffer_paths=None):
    return {"method": "update", "state": state, "buffer_paths": buffer_paths or []}


class KernelHostileTests(unittest.TestCase):
    @classmethod
    def setUpClass(cls):
        cls.km, cls.kc = start_new_kernel(kernel_name="quietframe-ts", startup_timeout=TIMEOUT)
        cls.fe = LiveFrontend(cls.kc)
        reply, msgs, _ = cls.fe.execute(KERNEL + EXPLORER_CELL + new_explorer_cell("w") + "const prototypeNames = Object.getOwnPropertyNames(Object.prototype).sort();")
        assert reply["status"] == "ok", (reply, [m["content"] for m in msgs])
        cls.ids = explorer_ids(msgs)
        cls.values = cls.fe.json_out("console.log(JSON.stringify(w.values))")

    @classmethod
    def tearDownClass(cls):
        cls.kc.stop_channels()
        cls.km.shutdown_kernel(now=True)

    def assert_intact(self):
        """Every widget as it was, nothing on Object.prototype, and a new explorer() cell works."""
        k = self.fe.json_out(
            "console.log(JSON.stringify({values: w.values, state: w.state.values, error: w.error ?? null,"
            f' slider: held("{self.ids["slider"]}").value, chart: held("{self.ids["chart"]}").explorer_state.fingerprint, fingerprint: w.state.fingerprint,'
            " prototype: JSON.stringify(Object.getOwnPropertyNames(Object.prototype).sort()) === JSON.stringify(prototypeNames),"
            " plain: [({} as any).value, ({} as any).curve, ({} as any).prototype].every((v) => v === undefined),"
            ' fresh: nb.explorer(setup, OPTS).values}))'
        )
        self.assertEqual(k["values"], self.values)
        self.assertEqual(k["state"], self.values)
        self.assertIsNone(k["error"])
        self.assertEqual(k["chart"], k["fingerprint"])
        self.assertTrue(k["prototype"])
        self.assertTrue(k["plain"])
        self.assertEqual(k["fresh"], self.values)

    def refusal(self, msgs):
        """The one error a refused widget message gets back (messages.md: a custom message on the same comm)."""
        errors = [m["content"]["data"]["content"]["error"] for m in comm_msgs(msgs, "custom") if "error" in m["content"]["data"]["content"]]
        self.assertEqual(len(errors), 1, [m["content"] for m in msgs])
        self.assertEqual(comm_msgs(msgs, "echo_update"), [])
        self.assertLess(len(json.dumps([m["content"] for m in msgs])), BOUNDED)
        return errors[0]

    def test_prototype_paths_are_refused(self):
        payload = b"\x00" * 8
        for model in ["slider", "chart"]:
            for data, buffers, named in [
                (update({}, [["__proto__", "value"]]), [payload], "__proto__"),
                (update({}, [["constructor", "prototype", "value"]]), [payload], "constructor"),
                (update({"__proto__": {"value": 1}}), None, "__proto__"),
                (update({"constructor": 1}), None, "constructor"),
                (update({"prototype": {"curve": 1}}), None, "prototype"),
            ]:
                with self.subTest(model=model, data=data):
                    msg_id = self.fe.send_nowait("comm_msg", {"comm_id": self.ids[model], "data": data}, buffers)
                    msgs = self.fe.collect(msg_id)
                    error = self.refusal(msgs)
                    # The error names the path it refused.
                    self.assertIn(named, error["message"])
                    self.assertIn("reserved", error["message"])
        self.assert_intact()

    def test_messages_over_the_limit_are_refused_before_parsing(self):
        for data, buffers in [
            ({"method": "m" * HUGE}, None),
            (update({"nosuchkey": None}, [["nosuchkey"]]), [b"\x01" * HUGE]),
        ]:
            with self.subTest(size=HUGE):
                msg_id = self.fe.send_nowait("comm_msg", {"comm_id": self.ids["slider"], "data": data}, buffers)
                msgs = self.fe.collect(msg_id)
                # Messaging spec, "Kernel status": still busy and idle; nothing else comes back.
                self.assertEqual([(m["msg_type"], m["content"]["execution_state"]) for m in msgs], [("status", "busy"), ("status", "idle")])
        # A request with a reply gets the refusal in it, with the limit.
        msg_id = self.kc.execute("// " + "x" * HUGE)
        msgs = self.fe.collect(msg_id)
        while True:
            reply = self.kc.get_shell_msg(timeout=TIMEOUT)
            if reply["parent_header"].get("msg_id") == msg_id:
                break
        self.assertEqual(reply["content"]["status"], "error")
        self.assertEqual(reply["content"]["ename"], "QuietframeError")
        self.assertIn(str(MESSAGE_LIMIT), reply["content"]["evalue"])
        self.assertLess(len(json.dumps(reply["content"])), BOUNDED)
        self.assertEqual([m["msg_type"] for m in msgs], ["status", "status"])
        self.assert_intact()

    def test_long_names_and_values_are_cut_in_errors(self):
        cases = [
            ({"method": "m" * LONG}, None, "cut to 120"),
            (update({"k" * LONG: 1}), None, "cut to 120"),
            (update({"nosuchkey": None}, [["nosuchkey"]]), [b"\x01" * LONG], f"{LONG} bytes of binary data"),
            (update({"value": "v" * LONG}), None, "..."),
        ]
        for data, buffers, shown in cases:
            with self.subTest(shown=shown):
                msg_id = self.fe.send_nowait("comm_msg", {"comm_id": self.ids["slider"], "data": data}, buffers)
                error = self.refusal(self.fe.collect(msg_id))
                self.assertIn(shown, error["message"])
        # A message type no kernel serves, a megabyte long: busy and idle, nothing else.
        msgs = self.fe.collect(self.fe.send_nowait("t" * LONG + "_request", {}))
        self.assertEqual([(m["msg_type"], m["content"]["execution_state"]) for m in msgs], [("status", "busy"), ("status", "idle")])
        # An unknown comm id or target: the comm_close's error text is cut too.
        for msg_type, content in [
            ("comm_msg", {"comm_id": "c" * LONG, "data": {"method": "request_state"}}),
            ("comm_open", {"comm_id": uuid.uuid4().hex, "target_name": "t" * LONG, "data": {}}),
        ]:
            with self.subTest(msg_type=msg_type):
                msgs = self.fe.collect(self.fe.send_nowait(msg_type, content))
                [close] = [m for m in msgs if m["msg_type"] == "comm_close"]
                self.assertIn("cut to 120", close["content"]["data"]["error"])
                self.assertLess(len(close["content"]["data"]["error"]), BOUNDED)
        self.assert_intact()

    def test_kernel_comm_ids_cannot_be_reused_by_a_front_end(self):
        for target, model in [("no.such.target", "chart"), ("jupyter.widget", "slider"), ("jupyter.widget.control", "box")]:
            with self.subTest(target=target):
                msgs = self.fe.collect(self.fe.send_nowait("comm_open", {"comm_id": self.ids[model], "target_name": target, "data": {}}))
                # No comm_close for the kernel's comm: it would close the widget for every front-end.
                self.assertEqual([m for m in msgs if m["msg_type"] == "comm_close"], [])
        # Messaging spec, "Comm info": the kernel's comms are still open, with their own target.
        info_id = self.kc.comm_info()
        while True:
            reply = self.kc.get_shell_msg(timeout=TIMEOUT)
            if reply["parent_header"].get("msg_id") == info_id:
                break
        for model in ["slider", "chart", "box"]:
            self.assertEqual(reply["content"]["comms"][self.ids[model]], {"target_name": "jupyter.widget"})
        # ...and live: a front-end move is echoed and recomputed, then put back.
        _, msgs = self.fe.comm_msg(self.ids["slider"], update({"value": 80}))
        self.assertEqual([m["content"]["data"]["state"] for m in comm_msgs(msgs, "echo_update")], [{"value": 80}])
        self.assertEqual(len([m for m in comm_msgs(msgs, "update") if m["content"]["comm_id"] == self.ids["chart"]]), 1)
        self.fe.stdout(f"w.set({json.dumps(self.values)})")
        self.assert_intact()

    def test_a_closed_chart_closes_its_explorer_which_refuses_changes(self):
        reply, msgs, _ = self.fe.execute(new_explorer_cell("w2"))
        self.assertEqual(reply["status"], "ok")
        ids = explorer_ids(msgs)
        self.fe.comm_msg(ids["slider"], update({"value": 70}))
        # A front-end closes the chart: the kernel closes the explorer's other models too.
        _, msgs = self.fe.send("comm_close", {"comm_id": ids["chart"], "data": {}})
        closed = {m["content"]["comm_id"] for m in msgs if m["msg_type"] == "comm_close"}
        self.assertTrue({ids["slider"], ids["box"]} <= closed, closed)
        # set() refuses with a QuietframeError; values and state stay those of the last chart.
        k = self.fe.json_out(
            'let refused: any; try { w2.set("detector.efficiency", "60 %"); } catch (e) { refused = e; }'
            " console.log(JSON.stringify({name: refused?.name, message: refused?.message, values: w2.values, state: w2.state.values}))"
        )
        self.assertEqual(k["name"], "QuietframeError")
        self.assertIn("closed", k["message"])
        self.assertEqual(k["values"], k["state"])
        self.assertEqual(k["values"]["detector.efficiency"], "70 %")
        # A move on the closed slider no longer changes anything: the kernel answers with comm_close.
        _, msgs = self.fe.comm_msg(ids["slider"], update({"value": 55}))
        self.assertEqual([m["content"]["comm_id"] for m in msgs if m["msg_type"] == "comm_close"], [ids["slider"]])
        self.assertEqual(self.fe.json_out("console.log(JSON.stringify(w2.values))"), k["values"])
        # show() again opens a new live widget from the last state, which moves again.
        reply, msgs, _ = self.fe.execute('await w2.show(); w2.set("detector.efficiency", "60 %"); console.log(JSON.stringify([w2.values, w2.state.values]))')
        self.assertEqual(reply["status"], "ok", [m["content"] for m in msgs])
        again = explorer_ids(msgs)
        self.assertNotEqual(again["chart"], ids["chart"])
        self.assertEqual([m["content"]["data"]["state"] for m in comm_msgs(msgs, "update") if m["content"]["comm_id"] == again["slider"]], [{"value": 60}])
        self.assert_intact()


if __name__ == "__main__":
    result = unittest.main(module=__name__, argv=[sys.argv[0], "-v"], exit=False).result
    print(f"HOSTILE run={result.testsRun} failures={len(result.failures)} errors={len(result.errors)} skipped={len(result.skipped)}")
    sys.exit(0 if result.wasSuccessful() else 1)
