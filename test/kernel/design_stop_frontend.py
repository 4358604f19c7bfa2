"""jupyter_client (Debian) as the front-end of a design run in the quietframe kernel.

Driven by design-stop.test.ts with the kernel spec in a private prefix. A cell awaits
w.run(...) of a Monte Carlo widget; while it runs, the front-end clicks the Stop button the
kernel displayed (a custom message {"event": "click"}, as ipywidgets' ButtonView sends it:
@jupyter-widgets/schema messages.md, "Custom messages"), or interrupts the kernel (the
kernel spec's interrupt_mode "signal": jupyter_client sends SIGINT). Sources: the Jupyter
messaging protocol ("Custom Messages", "Kernel interrupt", "Kernel status").
"""

import sys
import time
import unittest

from jupyter_client.manager import start_new_kernel

TIMEOUT = 60
# tslab aborts the requests that arrive within 200 ms of a failed cell (its execute queue's reset).
AFTER_ERROR_S = 0.5
SETUP = (
    'const nb = require("./dist/widgets/notebook");'
    'const setup = nb.loadSetupFile("examples/free-test-mass.json");'
    'const grid = { from: "10 Hz", to: "10 kHz", points: 31 };'
    'const w = nb.spreadWidget(setup, { kind: "margin-at", frequency: "300 Hz" }, [{ target: "detector.efficiency", value: "95 % ± 2 %" }], { grid, samples: 200, seed: 7 });'
    "console.log(w.fingerprint)"
)


def stdout_of(msgs, name="stdout"):
    return "".join(m["content"]["text"] for m in msgs if m["msg_type"] == "stream" and m["content"]["name"] == name)


class DesignStopTests(unittest.TestCase):
    @classmethod
    def setUpClass(cls):
        cls.km, cls.kc = start_new_kernel(kernel_name="quietframe-ts", startup_timeout=TIMEOUT)
        reply, msgs = cls.execute(SETUP)
        assert reply["status"] == "ok", (reply, [m["content"] for m in msgs])
        cls.fingerprint = stdout_of(msgs).strip()

    @classmethod
    def tearDownClass(cls):
        cls.kc.stop_channels()
        cls.km.shutdown_kernel(now=True)

    @classmethod
    def collect(cls, msg_id, until=None):
        """iopub messages parented to msg_id up to idle, or up to the first that `until` accepts."""
        msgs = []
        while True:
            m = cls.kc.get_iopub_msg(timeout=TIMEOUT)
            if m["parent_header"].get("msg_id") != msg_id:
                continue
            msgs.append(m)
            if until is not None and until(m):
                return msgs
            if until is None and m["msg_type"] == "status" and m["content"]["execution_state"] == "idle":
                return msgs

    @classmethod
    def reply_to(cls, msg_id):
        while True:
            reply = cls.kc.get_shell_msg(timeout=TIMEOUT)
            if reply["parent_header"].get("msg_id") == msg_id:
                return reply["content"]

    @classmethod
    def execute(cls, code):
        msg_id = cls.kc.execute(code)
        msgs = cls.collect(msg_id)
        return cls.reply_to(msg_id), msgs

    def start_run(self, code):
        """Starts a cell and returns its id and the comm id of the Stop button it shows."""
        msg_id = self.kc.execute(code)

        def is_button_or_idle(m):
            if m["msg_type"] == "status":
                return m["content"]["execution_state"] == "idle"
            return m["msg_type"] == "comm_open" and m["content"]["data"]["state"].get("_model_name") == "ButtonModel"

        opened = self.collect(msg_id, until=is_button_or_idle)
        self.assertEqual(opened[-1]["msg_type"], "comm_open", [m["content"] for m in opened])
        return msg_id, opened[-1]["content"]["comm_id"]

    def stopped_message(self):
        """What the cell's run ended with, awaited in a cell of its own."""
        reply, msgs = self.execute('console.log(await globalThis.runP.then(() => "finished", (e) => e.message))')
        self.assertEqual(reply["status"], "ok", [m["content"] for m in msgs])
        return stdout_of(msgs).strip()

    def assert_answer_kept(self):
        reply, msgs = self.execute("console.log(w.fingerprint)")
        self.assertEqual(stdout_of(msgs).strip(), self.fingerprint)

    def test_stop_button_click_during_the_cell_stops_the_run(self):
        msg_id, button = self.start_run("globalThis.runP = w.run({ samples: 100000, seed: 8 }); await globalThis.runP")
        click = self.kc.session.msg("comm_msg", {"comm_id": button, "data": {"method": "custom", "content": {"event": "click"}}})
        self.kc.shell_channel.send(click)
        msgs = self.collect(msg_id)
        reply = self.reply_to(msg_id)
        time.sleep(AFTER_ERROR_S)
        self.assertNotEqual(reply["status"], "ok")
        self.assertRegex(stdout_of(msgs, "stderr"), r"spread stopped after \d+ of 100000 samples; no result is given for a stopped run")
        self.assertRegex(self.stopped_message(), r"^spread stopped after \d+ of 100000 samples")
        self.assert_answer_kept()

    def test_kernel_interrupt_stops_the_run(self):
        msg_id, _ = self.start_run("globalThis.runP = w.run({ samples: 100000, seed: 9 }); await globalThis.runP")
        self.km.interrupt_kernel()
        msgs = self.collect(msg_id)
        reply = self.reply_to(msg_id)
        time.sleep(AFTER_ERROR_S)
        self.assertNotEqual(reply["status"], "ok")
        self.assertIn("Interrupted", stdout_of(msgs, "stderr"))
        self.assertRegex(self.stopped_message(), r"^spread stopped after \d+ of 100000 samples; no result is given for a stopped run$")
        self.assert_answer_kept()
        # Not stopped, the next run finishes and the widget is usable as before.
        reply, msgs = self.execute("await w.run({ samples: 200, seed: 7 }); console.log(w.fingerprint)")
        self.assertEqual(reply["status"], "ok", [m["content"] for m in msgs])
        self.assertEqual(stdout_of(msgs).strip().splitlines()[-1], self.fingerprint)


if __name__ == "__main__":
    result = unittest.main(module=__name__, argv=[sys.argv[0], "-v"], exit=False).result
    print(f"DESIGNSTOP run={result.testsRun} failures={len(result.failures)} errors={len(result.errors)} skipped={len(result.skipped)}")
    sys.exit(0 if result.wasSuccessful() else 1)
