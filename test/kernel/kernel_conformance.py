"""Conformance of the quietframe kernel, run by Debian's jupyter_kernel_test (the Jupyter
project's kernel test machinery) through jupyter_client. Driven by kernel-conformance.test.ts
with the kernel spec in a private prefix (JUPYTER_PATH). Each message is validated against
the message schemas of messaging protocol 5 that the package ships (msgspec_v5)."""

import sys
import unittest

import jupyter_kernel_test
from jupyter_kernel_test.msgspec_v5 import validate_message

TIMEOUT = 60


class QuietframeKernelTests(jupyter_kernel_test.KernelTests):
    kernel_name = "quietframe-ts"
    language_name = "typescript"
    file_extension = ".ts"

    # Messaging spec, "Streams (stdout, stderr, etc)".
    code_hello_world = 'console.log("hello, world")'
    code_stderr = 'console.error("some error")'

    # Messaging spec, "Completion": tslab completes members after the dot.
    completion_samples = [{"text": "Math.floo", "matches": {"floor"}}]

    # Messaging spec, "Code completeness".
    complete_code_samples = ["1 + 1", "const x = 3;"]
    incomplete_code_samples = ["function f() {"]

    # Messaging spec, "Display Data": quietframe's own display path under this kernel.
    code_display_data = [
        {
            "code": 'require("./dist/widgets/notebook").displayBundle({"text/html": "<b>hi</b>", "text/plain": "hi"})',
            "mime": "text/html",
        },
        {"code": 'require("tslab").display.html("<i>tslab</i>")', "mime": "text/html"},
    ]

    code_inspect_sample = "Math"

    # Not features of tslab's executor, so not claimed here: a pager, history, execute_result
    # (tslab prints a cell's value on stdout), error messages (tslab reports on stderr),
    # clear_output.
    test_pager = None
    test_history = None
    test_execute_result = None
    test_error = None
    test_clear_output = None

    @classmethod
    def setUpClass(cls):
        super().setUpClass()
        # The first cell starts the TypeScript compiler: allow it time once.
        msg_id = cls.kc.execute("1")
        while True:
            reply = cls.kc.get_shell_msg(timeout=TIMEOUT)
            if reply["parent_header"].get("msg_id") == msg_id:
                break

    def comm_info(self, target_name=None):
        msg_id = self.kc.comm_info(target_name)
        reply = self.get_non_kernel_info_reply(timeout=TIMEOUT)
        # Messaging spec, "Comm info": a comm_info_reply with status ok and comms.
        validate_message(reply, "comm_info_reply", msg_id)
        return reply["content"]["comms"]

    def test_comm_info(self):
        self.flush_channels()
        before = self.comm_info()
        self.assertIsInstance(before, dict)
        # A widget opens comms to "jupyter.widget" (its model, layout and style).
        code = 'const infoSlider = require("./dist/widgets/kernel").floatSlider({value: 1}); console.log(infoSlider.id)'
        msg_id = self.kc.execute(code)
        model_id = None
        while model_id is None:
            msg = self.kc.get_iopub_msg(timeout=TIMEOUT)
            if msg["parent_header"].get("msg_id") == msg_id and msg["msg_type"] == "stream" and msg["content"]["name"] == "stdout":
                model_id = msg["content"]["text"].strip()
        self.get_non_kernel_info_reply(timeout=TIMEOUT)
        comms = self.comm_info("jupyter.widget")
        self.assertIn(model_id, comms)
        self.assertEqual(comms[model_id], {"target_name": "jupyter.widget"})
        self.assertEqual(len(comms) - len(before), 3)
        # Filtered by target_name: no comm of another target is listed.
        self.assertEqual(self.comm_info("no.such.target"), {})
        self.flush_channels()


if __name__ == "__main__":
    result = unittest.main(module=__name__, argv=[sys.argv[0], "-v"], exit=False).result
    # One line the vitest driver reads: counts as unittest sees them.
    print(f"CONFORMANCE run={result.testsRun} failures={len(result.failures)} errors={len(result.errors)} skipped={len(result.skipped)}")
    sys.exit(0 if result.wasSuccessful() else 1)
