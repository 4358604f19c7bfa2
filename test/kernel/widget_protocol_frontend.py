"""jupyter_client (Debian) acting as a widget front-end against the quietframe kernel.

Driven by widget-protocol.test.ts with the kernel spec in a private prefix. Sources of the
checks: the Jupyter messaging protocol ("Custom Messages" — comm_open / comm_msg /
comm_close, "Comm info", "Kernel status") and the widget message protocol in
@jupyter-widgets/schema's messages.md ("Widget messaging protocol, version 2" with the 2.1
echo_update, and "Control Widget messaging protocol, version 1.0").
"""

import json
import struct
import sys
import unittest
import uuid
from queue import Empty

from jupyter_client.manager import start_new_kernel

TIMEOUT = 60
KERNEL = 'const k = require("./dist/widgets/kernel");'


class Frontend:
    def __init__(self, kc):
        self.kc = kc

    def collect(self, msg_id):
        """iopub messages parented to msg_id, from busy to idle (messaging spec, "Kernel status")."""
        msgs = []
        while True:
            m = self.kc.get_iopub_msg(timeout=TIMEOUT)
            if m["parent_header"].get("msg_id") != msg_id:
                continue
            msgs.append(m)
            if m["msg_type"] == "status" and m["content"]["execution_state"] == "idle":
                return msgs

    def execute(self, code):
        msg_id = self.kc.execute(code)
        msgs = self.collect(msg_id)
        while True:
            reply = self.kc.get_shell_msg(timeout=TIMEOUT)
            if reply["parent_header"].get("msg_id") == msg_id:
                return reply["content"], msgs, msg_id

    def stdout(self, code):
        reply, msgs, _ = self.execute(code)
        if reply["status"] != "ok":
            raise AssertionError(f"cell failed: {reply}: {[m['content'] for m in msgs]}")
        return "".join(m["content"]["text"] for m in msgs if m["msg_type"] == "stream" and m["content"]["name"] == "stdout")

    def send(self, msg_type, content, buffers=None):
        msg = self.kc.session.msg(msg_type, content)
        if buffers:
            msg["buffers"] = buffers
        self.kc.shell_channel.send(msg)
        return msg["header"]["msg_id"], self.collect(msg["header"]["msg_id"])

    def comm_msg(self, comm_id, data, buffers=None):
        return self.send("comm_msg", {"comm_id": comm_id, "data": data}, buffers)


def comm_msgs(msgs, method=None):
    out = [m for m in msgs if m["msg_type"] == "comm_msg"]
    return [m for m in out if method is None or m["content"]["data"].get("method") == method]


class WidgetProtocolTests(unittest.TestCase):
    @classmethod
    def setUpClass(cls):
        cls.km, cls.kc = start_new_kernel(kernel_name="quietframe-ts", startup_timeout=TIMEOUT)
        cls.fe = Frontend(cls.kc)
        reply, msgs, msg_id = cls.fe.execute(
            KERNEL
            + 'const slider = k.floatSlider({value: 2, min: 0, max: 10, description: "x"});'
            + "const seen: unknown[] = []; const custom: unknown[] = [];"
            + 'slider.on("change:value", (v, old, source) => seen.push([v, old, source]));'
            + 'slider.on("custom", (c) => custom.push(c));'
            + "k.displayWidget(slider);"
            + "const other = k.floatSlider({value: 1, min: 0, max: 5});"
            + 'const counter = new k.WidgetModel({_model_name: "CounterModel", _model_module: "quietframe-test", _model_module_version: "0.0.0",'
            + ' _view_name: "CounterView", _view_module: "quietframe-test", _view_module_version: "0.0.0", count: 0, curve: new Float64Array([1.5, 2.5])},'
            + ' {validators: {count: (v) => { if (!Number.isInteger(v) || (v as number) < 0) throw new Error("must be a whole number ≥ 0"); return v; }}});'
            + "console.log(JSON.stringify({slider: slider.id, layout: slider.parts.layout.id, other: other.id, counter: counter.id}))"
        )
        assert reply["status"] == "ok", (reply, [m["content"] for m in msgs])
        cls.open_msgs = msgs
        cls.exec_id = msg_id
        text = "".join(m["content"]["text"] for m in msgs if m["msg_type"] == "stream" and m["content"]["name"] == "stdout")
        cls.ids = json.loads(text.strip().splitlines()[-1])

    @classmethod
    def tearDownClass(cls):
        cls.kc.stop_channels()
        cls.km.shutdown_kernel(now=True)

    def value(self, name="slider"):
        return json.loads(self.fe.stdout(f'console.log(JSON.stringify({name}.get("value")))').strip())

    def assert_error(self, msgs, path_part):
        """The refusal arrives as a custom message with an error payload on the same comm."""
        errors = [m for m in comm_msgs(msgs, "custom") if "error" in m["content"]["data"]["content"]]
        self.assertEqual(len(errors), 1, [m["content"] for m in msgs])
        error = errors[0]["content"]["data"]["content"]["error"]
        self.assertIn(path_part, error["message"])
        return error

    def assert_alive_and_other_works(self):
        """After a refused message the kernel still runs cells and another widget still syncs."""
        self.assertEqual(self.fe.stdout("console.log(1 + 1)").strip(), "2")
        v = self.value("other") + 0.5 if self.value("other") < 4 else 0.5
        msg_id, msgs = self.fe.comm_msg(self.ids["other"], {"method": "update", "state": {"value": v}, "buffer_paths": []})
        self.assertEqual([m["content"]["data"]["state"] for m in comm_msgs(msgs, "echo_update")], [{"value": v}])
        self.assertEqual(self.value("other"), v)

    # --- opening and display -------------------------------------------------------------

    def test_comm_open_carries_full_state_and_protocol_version(self):
        opens = [m for m in self.open_msgs if m["msg_type"] == "comm_open"]
        by_id = {m["content"]["comm_id"]: m for m in opens}
        slider = by_id[self.ids["slider"]]
        # messages.md v2, "Instantiating a widget object": target jupyter.widget, data.state +
        # data.buffer_paths, metadata.version = protocol version (2.1.0 adds echo_update).
        self.assertEqual(slider["content"]["target_name"], "jupyter.widget")
        self.assertEqual(slider["metadata"], {"version": "2.1.0"})
        state = slider["content"]["data"]["state"]
        self.assertEqual(slider["content"]["data"]["buffer_paths"], [])
        self.assertEqual((state["_model_name"], state["_model_module"], state["_model_module_version"]), ("FloatSliderModel", "@jupyter-widgets/controls", "2.0.0"))
        self.assertEqual((state["_view_name"], state["_view_module"], state["_view_module_version"]), ("FloatSliderView", "@jupyter-widgets/controls", "2.0.0"))
        self.assertEqual((state["value"], state["min"], state["max"], state["description"]), (2, 0, 10, "x"))
        # The layout reference points at a model opened before it (front-ends resolve IPY_MODEL_ ids).
        self.assertEqual(state["layout"], "IPY_MODEL_" + self.ids["layout"])
        self.assertLess(opens.index(by_id[self.ids["layout"]]), opens.index(slider))
        # Messaging spec, "Custom Messages": kernel-opened comms are parented to the request.
        self.assertEqual(slider["parent_header"]["msg_id"], self.exec_id)

    def test_display_data_has_widget_view_mime(self):
        shown = [m for m in self.open_msgs if m["msg_type"] == "display_data"]
        self.assertEqual(len(shown), 1)
        data = shown[0]["content"]["data"]
        # messages.md v2, "Displaying widgets".
        self.assertEqual(data["application/vnd.jupyter.widget-view+json"], {"model_id": self.ids["slider"], "version_major": 2, "version_minor": 1})
        self.assertIn("text/plain", data)

    def test_binary_buffers_both_ways(self):
        opens = {m["content"]["comm_id"]: m for m in self.open_msgs if m["msg_type"] == "comm_open"}
        counter = opens[self.ids["counter"]]
        # messages.md v2: a binary value under a key is left out of data.state, its path in buffer_paths.
        self.assertEqual(counter["content"]["data"]["buffer_paths"], [["curve"]])
        self.assertNotIn("curve", counter["content"]["data"]["state"])
        self.assertEqual(bytes(counter["buffers"][0]), struct.pack("<2d", 1.5, 2.5))
        payload = struct.pack("<d", 3.25)
        _, msgs = self.fe.comm_msg(self.ids["counter"], {"method": "update", "state": {}, "buffer_paths": [["curve"]]}, [payload])
        echo = comm_msgs(msgs, "echo_update")
        self.assertEqual(len(echo), 1)
        self.assertEqual(echo[0]["content"]["data"]["buffer_paths"], [["curve"]])
        self.assertEqual(bytes(echo[0]["buffers"][0]), payload)
        got = self.fe.stdout('console.log(JSON.stringify(Array.from(counter.get("curve") as Uint8Array)))')
        self.assertEqual(json.loads(got), list(payload))

    # --- state sync ------------------------------------------------------------------------

    def test_update_from_frontend_is_applied_and_echoed(self):
        self.fe.execute("slider.set({value: 2})")
        msg_id, msgs = self.fe.comm_msg(self.ids["slider"], {"method": "update", "state": {"value": 7.5}, "buffer_paths": []})
        # Messaging spec, "Kernel status": busy first, idle last, both parented to the request.
        self.assertEqual((msgs[0]["msg_type"], msgs[0]["content"]["execution_state"]), ("status", "busy"))
        self.assertEqual((msgs[-1]["msg_type"], msgs[-1]["content"]["execution_state"]), ("status", "idle"))
        echo = comm_msgs(msgs, "echo_update")
        # messages.md, "echo_update": the applied state, parented to the front-end's update.
        self.assertEqual(len(echo), 1)
        self.assertEqual(echo[0]["content"]["data"]["state"], {"value": 7.5})
        self.assertEqual(echo[0]["parent_header"]["msg_id"], msg_id)
        self.assertEqual(self.value(), 7.5)
        # The kernel's change listener saw it, with the old value and where it came from.
        seen = json.loads(self.fe.stdout("console.log(JSON.stringify(seen))"))
        self.assertEqual(seen[-1], [7.5, 2, "frontend"])

    def test_request_state_answers_full_state(self):
        self.fe.comm_msg(self.ids["slider"], {"method": "update", "state": {"value": 4}, "buffer_paths": []})
        msg_id, msgs = self.fe.comm_msg(self.ids["slider"], {"method": "request_state"})
        updates = comm_msgs(msgs, "update")
        # messages.md, "State requests": an update with the entire state.
        self.assertEqual(len(updates), 1)
        state = updates[0]["content"]["data"]["state"]
        self.assertEqual(state["value"], 4)
        self.assertEqual(state["_model_name"], "FloatSliderModel")
        self.assertIn("layout", state)
        self.assertEqual(updates[0]["parent_header"]["msg_id"], msg_id)

    def test_set_from_kernel_sends_update(self):
        reply, msgs, msg_id = self.fe.execute("slider.set({value: 3})")
        self.assertEqual(reply["status"], "ok")
        updates = comm_msgs(msgs, "update")
        # messages.md, "Synchronizing widget state: update" (kernel → front-end).
        self.assertEqual([(u["content"]["comm_id"], u["content"]["data"]["state"]) for u in updates], [(self.ids["slider"], {"value": 3})])
        self.assertEqual(updates[0]["parent_header"]["msg_id"], msg_id)

    def test_custom_messages_both_ways(self):
        self.fe.comm_msg(self.ids["slider"], {"method": "custom", "content": {"hello": 1}})
        self.assertIn({"hello": 1}, json.loads(self.fe.stdout("console.log(JSON.stringify(custom))")))
        _, msgs, _ = self.fe.execute("slider.send({ping: 2})")
        # messages.md, "Custom messages: custom".
        self.assertEqual([m["content"]["data"] for m in comm_msgs(msgs, "custom")], [{"method": "custom", "content": {"ping": 2}}])

    def test_control_target_request_states(self):
        comm_id = uuid.uuid4().hex
        self.fe.send("comm_open", {"comm_id": comm_id, "target_name": "jupyter.widget.control", "data": {}})
        _, msgs = self.fe.comm_msg(comm_id, {"method": "request_states"})
        # messages.md, "Control Widget messaging protocol": update_states with every widget's state,
        # each as widget managers read it (ipywidgets' ManagerBase._loadFromKernel and the Python
        # kernel side: {model_name, model_module, model_module_version, state}).
        replies = comm_msgs(msgs, "update_states")
        self.assertEqual(len(replies), 1)
        data = replies[0]["content"]["data"]
        slider = data["states"][self.ids["slider"]]
        self.assertEqual(slider["model_name"], "FloatSliderModel")
        self.assertEqual(slider["model_module"], "@jupyter-widgets/controls")
        self.assertEqual(slider["state"]["_model_name"], "FloatSliderModel")
        self.assertIn([self.ids["counter"], "state", "curve"], data["buffer_paths"])
        self.fe.send("comm_close", {"comm_id": comm_id, "data": {}})

    # --- bad input -------------------------------------------------------------------------

    def test_out_of_range_value_is_refused_and_restored(self):
        before = self.value()
        _, msgs = self.fe.comm_msg(self.ids["slider"], {"method": "update", "state": {"value": 50}, "buffer_paths": []})
        error = self.assert_error(msgs, "FloatSliderModel.value")
        self.assertIn("0 ≤ value ≤ 10", error["allowed"])
        self.assertEqual([m["content"]["data"]["state"] for m in comm_msgs(msgs, "update")], [{"value": before}])
        self.assertEqual(comm_msgs(msgs, "echo_update"), [])
        self.assertEqual(self.value(), before)
        self.assert_alive_and_other_works()

    def test_wrong_type_is_refused(self):
        before = self.value()
        _, msgs = self.fe.comm_msg(self.ids["slider"], {"method": "update", "state": {"value": "abc"}, "buffer_paths": []})
        self.assert_error(msgs, "a finite number")
        self.assertEqual(self.value(), before)
        self.assert_alive_and_other_works()

    def test_validator_of_a_model_refuses(self):
        _, msgs = self.fe.comm_msg(self.ids["counter"], {"method": "update", "state": {"count": -1}, "buffer_paths": []})
        self.assert_error(msgs, "whole number")
        self.assertEqual([m["content"]["data"]["state"] for m in comm_msgs(msgs, "update")], [{"count": 0}])
        _, msgs = self.fe.comm_msg(self.ids["counter"], {"method": "update", "state": {"count": 4}, "buffer_paths": []})
        self.assertEqual([m["content"]["data"]["state"] for m in comm_msgs(msgs, "echo_update")], [{"count": 4}])
        self.assert_alive_and_other_works()

    def test_unknown_key_and_immutable_key_are_refused(self):
        _, msgs = self.fe.comm_msg(self.ids["slider"], {"method": "update", "state": {"nonsense": 1}, "buffer_paths": []})
        self.assert_error(msgs, "is not a key of this model")
        _, msgs = self.fe.comm_msg(self.ids["slider"], {"method": "update", "state": {"_model_name": "Other"}, "buffer_paths": []})
        self.assert_error(msgs, "fixed when the model is created")
        self.assertEqual(self.fe.stdout('console.log(slider.get("_model_name"))').strip(), "FloatSliderModel")
        self.assert_alive_and_other_works()

    def test_malformed_messages_are_refused(self):
        for data, expect in [
            ({"method": "frobnicate"}, 'unknown method "frobnicate"'),
            ({}, "data.method is missing"),
            ({"method": "update", "state": [1, 2]}, "data.state must be an object"),
            ({"method": "update", "state": {}, "buffer_paths": [["value"]]}, "buffer_paths names 1 buffers but 0 arrived"),
            ([1, 2], "data must be a JSON object"),
        ]:
            with self.subTest(data=data):
                _, msgs = self.fe.comm_msg(self.ids["slider"], data)
                self.assert_error(msgs, expect)
        self.assert_alive_and_other_works()

    def test_missing_comm_id_is_ignored_and_kernel_lives(self):
        _, msgs = self.fe.send("comm_msg", {"data": {"method": "request_state"}})
        self.assertEqual(comm_msgs(msgs), [])
        self.assertEqual([m["msg_type"] for m in msgs], ["status", "status"])
        self.assert_alive_and_other_works()

    def test_unknown_comm_id_gets_comm_close(self):
        _, msgs = self.fe.comm_msg("no-such-model", {"method": "update", "state": {"value": 1}, "buffer_paths": []})
        closes = [m for m in msgs if m["msg_type"] == "comm_close"]
        # Messaging spec, "Custom Messages": the kernel closes a comm it does not know.
        self.assertEqual(len(closes), 1)
        self.assertEqual(closes[0]["content"]["comm_id"], "no-such-model")
        self.assertIn("no open comm", closes[0]["content"]["data"]["error"])
        self.assert_alive_and_other_works()

    def test_frontend_opened_comms_are_refused(self):
        for target in ["no.such.target", "jupyter.widget"]:
            with self.subTest(target=target):
                comm_id = uuid.uuid4().hex
                _, msgs = self.fe.send("comm_open", {"comm_id": comm_id, "target_name": target, "data": {}})
                closes = [m for m in msgs if m["msg_type"] == "comm_close"]
                self.assertEqual([c["content"]["comm_id"] for c in closes], [comm_id])
        self.assert_alive_and_other_works()

    def test_close_both_ways(self):
        reply, msgs, _ = self.fe.execute("const a = k.html({value: '<b>a</b>'}); const b = k.text({value: 'b'}); console.log(JSON.stringify([a.id, b.id]))")
        a_id, b_id = json.loads("".join(m["content"]["text"] for m in msgs if m["msg_type"] == "stream" and m["content"]["name"] == "stdout"))
        # Front-end closes a: the kernel forgets the comm (comm_info) and marks the model closed.
        self.fe.send("comm_close", {"comm_id": a_id, "data": {}})
        self.assertEqual(self.fe.stdout("console.log(a.isClosed)").strip(), "true")
        info_id = self.kc.comm_info("jupyter.widget")
        while True:
            reply = self.kc.get_shell_msg(timeout=TIMEOUT)
            if reply["parent_header"].get("msg_id") == info_id:
                break
        self.assertEqual(reply["msg_type"], "comm_info_reply")
        self.assertNotIn(a_id, reply["content"]["comms"])
        self.assertIn(b_id, reply["content"]["comms"])
        # Kernel closes b: comm_close on iopub.
        _, msgs, _ = self.fe.execute("b.close()")
        self.assertIn(b_id, [m["content"]["comm_id"] for m in msgs if m["msg_type"] == "comm_close"])


if __name__ == "__main__":
    result = unittest.main(module=__name__, argv=[sys.argv[0], "-v"], exit=False).result
    print(f"PROTOCOL run={result.testsRun} failures={len(result.failures)} errors={len(result.errors)} skipped={len(result.skipped)}")
    sys.exit(0 if result.wasSuccessful() else 1)
