"""What the load and hostile front-end scripts share: a live explorer in the kernel, and iopub
collected for many requests at once.

The explorer is the notebook API's (explorer(...).show()) on an example set-up with one slider
and a small frequency grid, so that thousands of recomputations stay quick. The front-end finds
the models' comm ids the way a widget manager does: from the comm_open messages of the cell.
Sources: the Jupyter messaging protocol ("Custom Messages", "Kernel status") and messages.md of
@jupyter-widgets/schema (widget protocol 2.1: update, echo_update).
"""

import json

from widget_protocol_frontend import TIMEOUT, Frontend, comm_msgs

CHART_MODEL = "QuietframeChartModel"

# One slider (detection efficiency, 50 % … 100 %) and 40 frequencies.
EXPLORER_CELL = """
const nb = require("./dist/widgets/notebook");
const registry = require("./dist/widgets/core/comm/widget-registry");
const setup = nb.loadSetupFile("./examples/cryogenic-membrane.json");
const OPTS = {
  controls: [{ target: "detector.efficiency", label: "detection efficiency", min: "50 %", max: "100 %" }],
  settings: { grid: { from: "100 kHz", to: "10 MHz", points: 40 } },
};
/** The kernel's own copy of a model's state (what request_state would answer). */
const held = (id: string) => registry.widgetRegistry().get(id)?.fullState().state;
"""


def new_explorer_cell(name):
    return f"const {name} = nb.explorer(setup, OPTS); await {name}.show();"


def opened(msgs, model_name):
    """comm_open messages of one model class, in order."""
    return [m for m in msgs if m["msg_type"] == "comm_open" and m["content"]["data"]["state"].get("_model_name") == model_name]


def explorer_ids(msgs):
    """Comm ids of the slider, the chart and the box a show() cell opened, and the slider's opening state."""
    [slider] = opened(msgs, "FloatSliderModel")
    [chart] = opened(msgs, CHART_MODEL)
    [box] = opened(msgs, "VBoxModel")
    return {"slider": slider["content"]["comm_id"], "chart": chart["content"]["comm_id"], "box": box["content"]["comm_id"], "slider_state": slider["content"]["data"]["state"]}


def snapped(state, value):
    """A value on the slider's positions (min + k·step), as the slider's own step defines them (from memory: the
    FloatSlider's step attribute, @jupyter-widgets/controls)."""
    k = round((value - state["min"]) / state["step"])
    return state["min"] + k * state["step"]


def percent(written):
    """The number of a value written as "72.25 %"."""
    number, unit = written.split()
    assert unit == "%", written
    return float(number)


class LiveFrontend(Frontend):
    def json_out(self, code):
        """Runs a cell whose last stdout line is JSON; returns it parsed."""
        return json.loads(self.stdout(code).strip().splitlines()[-1])

    def send_nowait(self, msg_type, content, buffers=None):
        msg = self.kc.session.msg(msg_type, content)
        if buffers:
            msg["buffers"] = buffers
        self.kc.shell_channel.send(msg)
        return msg["header"]["msg_id"]

    def collect_many(self, msg_ids):
        """iopub for every request in msg_ids, until each has had its idle; (by request, arrival order)."""
        waiting = set(msg_ids)
        by_parent = {i: [] for i in msg_ids}
        arrival = []
        while waiting:
            m = self.kc.get_iopub_msg(timeout=TIMEOUT)
            parent = m["parent_header"].get("msg_id")
            if parent not in by_parent:
                continue
            by_parent[parent].append(m)
            arrival.append(m)
            if m["msg_type"] == "status" and m["content"]["execution_state"] == "idle":
                waiting.discard(parent)
        return by_parent, arrival


__all__ = ["CHART_MODEL", "EXPLORER_CELL", "LiveFrontend", "comm_msgs", "explorer_ids", "new_explorer_cell", "opened", "percent", "snapped", "TIMEOUT"]
