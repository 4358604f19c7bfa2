import { describe, expect, it, vi } from "vitest";
import { installKernelComms, kernelComms } from "../../widgets/core/comm/kernel-comms";
import { frontEnd, recordingComms } from "./fake-transport";

// Jupyter messaging protocol, "Custom Messages": comm_open carries comm_id, target_name and
// data; comm_msg comm_id and data; comm_close comm_id and data; either side may open or
// close. "Comm info": comm_info_reply lists {comm_id: {target_name}}, filtered by target_name.

describe("CommManager", () => {
  it("opens a comm to the front-end with comm_open (comm_id, target_name, data)", () => {
    const { comms, sent } = recordingComms();
    const comm = comms.open("my.target", { a: 1 }, { version: "x" }, [new Uint8Array([1])]);
    expect(sent).toEqual([{ msgType: "comm_open", content: { comm_id: comm.id, target_name: "my.target", data: { a: 1 } }, metadata: { version: "x" }, buffers: [new Uint8Array([1])] }]);
    expect(comm.id).toMatch(/^[0-9a-f]{32}$/);
  });

  it("sends comm_msg and comm_close, then refuses to send on a closed comm", () => {
    const { comms, sent } = recordingComms();
    const comm = comms.open("t");
    comm.send({ hello: 1 });
    comm.close({ bye: true });
    comm.close(); // twice: nothing more
    expect(sent.slice(1).map((m) => [m.msgType, m.content])).toEqual([
      ["comm_msg", { comm_id: comm.id, data: { hello: 1 } }],
      ["comm_close", { comm_id: comm.id, data: { bye: true } }],
    ]);
    expect(() => comm.send({})).toThrow("is closed");
  });

  it("hands a front-end's comm_open to the registered target, and its messages to the comm", async () => {
    const { comms } = recordingComms();
    const got: unknown[] = [];
    comms.registerTarget("t", (comm, open) => {
      got.push(["open", open.data, open.targetName]);
      comm.onMessage((m) => void got.push(["msg", m.data, m.buffers.length]));
      comm.onClose((m) => void got.push(["close", m?.data]));
    });
    await comms.handle("comm_open", { comm_id: "c1", target_name: "t", data: { x: 1 } }, {}, [], "m1");
    await frontEnd(comms, "c1", { y: 2 }, [new Uint8Array(2)]);
    await comms.handle("comm_close", { comm_id: "c1", data: { z: 3 } }, {}, [], "m3");
    expect(got).toEqual([
      ["open", { x: 1 }, "t"],
      ["msg", { y: 2 }, 1],
      ["close", { z: 3 }],
    ]);
    expect(comms.get("c1")).toBeUndefined();
  });

  it("lists open comms for comm_info, filtered by target name", () => {
    const { comms } = recordingComms();
    const a = comms.open("a");
    const b = comms.open("b");
    expect(comms.commInfo()).toEqual({ [a.id]: { target_name: "a" }, [b.id]: { target_name: "b" } });
    expect(comms.commInfo("a")).toEqual({ [a.id]: { target_name: "a" } });
    expect(comms.commInfo("none")).toEqual({});
    b.close();
    expect(Object.keys(comms.commInfo())).toEqual([a.id]);
  });

  it("closes a comm opened to an unknown target and logs why", async () => {
    const { comms, sent, log } = recordingComms();
    await comms.handle("comm_open", { comm_id: "c9", target_name: "nope", data: {} }, {}, [], "m");
    expect(sent).toEqual([{ msgType: "comm_close", content: { comm_id: "c9", data: { error: 'no comm target "nope" in this kernel' } }, metadata: {}, buffers: [] }]);
    expect(log).toEqual(['comm_open c9 refused: no comm target "nope" in this kernel']);
  });

  it("logs a message without comm_id and answers nothing", async () => {
    const { comms, sent, log } = recordingComms();
    await comms.handle("comm_msg", { data: {} }, {}, [], "m7");
    expect(sent).toEqual([]);
    expect(log).toEqual(["comm_msg m7 ignored: content.comm_id must be a non-empty string, got nothing"]);
  });

  it("closes an unknown comm id back to the front-end", async () => {
    const { comms, sent, log } = recordingComms();
    await frontEnd(comms, "ghost", { a: 1 });
    expect(sent.map((m) => [m.msgType, m.content.comm_id])).toEqual([["comm_close", "ghost"]]);
    expect(log[0]).toMatch('no open comm "ghost"');
  });

  it("reports non-object data to the comm's invalid-message listeners instead of its message listeners", async () => {
    const { comms } = recordingComms();
    const comm = comms.open("t");
    const messages: unknown[] = [];
    const problems: string[] = [];
    comm.onMessage((m) => void messages.push(m));
    comm.onInvalid((p) => problems.push(p));
    await frontEnd(comms, comm.id, "text");
    expect(messages).toEqual([]);
    expect(problems).toEqual(['comm_msg data must be a JSON object, got "text"']);
  });

  it("survives a target or listener that throws, logging the failure", async () => {
    const { comms, log } = recordingComms();
    const comm = comms.open("t");
    comm.onMessage(() => {
      throw new Error("boom");
    });
    await expect(frontEnd(comms, comm.id, {})).resolves.toBeTypeOf("string");
    expect(log[0]).toMatch(/comm_msg on comm .*: handler failed: Error: boom/);
  });
});

describe("kernelComms", () => {
  it("is undefined outside the quietframe kernel and the installed manager inside it", () => {
    installKernelComms(undefined);
    expect(kernelComms()).toBeUndefined();
    const { comms } = recordingComms();
    installKernelComms(comms);
    try {
      expect(kernelComms()).toBe(comms);
      // Reachable through the global symbol, so a second copy of the module sees it too.
      expect((globalThis as Record<symbol, { comms: unknown }>)[Symbol.for("quietframe.kernel")].comms).toBe(comms);
    } finally {
      installKernelComms(undefined);
    }
  });

  it("is the same manager for a second, separately loaded copy of the module", async () => {
    const { comms } = recordingComms();
    installKernelComms(comms);
    try {
      vi.resetModules();
      const copy = (await import("../../widgets/core/comm/kernel-comms.js")) as typeof import("../../widgets/core/comm/kernel-comms.js");
      expect(copy.kernelComms).not.toBe(kernelComms); // really another module instance
      expect(copy.kernelComms()).toBe(comms);
    } finally {
      installKernelComms(undefined);
    }
  });

  it("refuses a front-end comm_open reusing the id of an open comm, without closing that comm", async () => {
    const { comms, sent, log } = recordingComms();
    comms.registerTarget("t", () => undefined);
    const kernels = comms.open("jupyter.widget");
    for (const target of ["no.such.target", "t"]) {
      await comms.handle("comm_open", { comm_id: kernels.id, target_name: target, data: {} }, {}, [], `m-${target}`);
    }
    // The only message is the kernel's own comm_open: no comm_close went out for its id.
    expect(sent.map((m) => m.msgType)).toEqual(["comm_open"]);
    expect(kernels.isClosed).toBe(false);
    expect(comms.get(kernels.id)).toBe(kernels);
    expect(log).toEqual([
      `comm_open ${kernels.id} refused: the id belongs to the open comm of target "jupyter.widget"; a front-end cannot replace it`,
      `comm_open ${kernels.id} refused: the id belongs to the open comm of target "jupyter.widget"; a front-end cannot replace it`,
    ]);
  });

  it("cuts long comm ids and target names in its log lines and errors", async () => {
    const { comms, sent, log } = recordingComms();
    await comms.handle("comm_open", { comm_id: "c".repeat(100_000), target_name: "t".repeat(100_000), data: {} }, {}, [], "m1");
    await comms.handle("comm_msg", { comm_id: "d".repeat(100_000), data: {} }, {}, [], "m2");
    expect(log).toHaveLength(2);
    for (const line of log) expect(line.length).toBeLessThan(500);
    expect(log[0]).toContain("(100000 characters, cut to 120)");
    for (const m of sent) expect(((m.content.data as { error: string }).error ?? "").length).toBeLessThan(500);
  });

  it("defers work by key while the server holds it, keeps only the newest task per key, and runs it on settle", () => {
    const { comms } = recordingComms();
    const ran: string[] = [];
    const a = {};
    const b = {};
    comms.defer(a, () => ran.push("now"));
    expect(ran).toEqual(["now"]);
    comms.holdDeferred(true);
    comms.defer(a, () => ran.push("a1"));
    comms.defer(b, () => ran.push("b1"));
    comms.defer(a, () => ran.push("a2"));
    expect(ran).toEqual(["now"]);
    comms.settle();
    expect(ran).toEqual(["now", "b1", "a2"]);
    comms.settle();
    expect(ran).toEqual(["now", "b1", "a2"]);
    comms.holdDeferred(false);
  });

  it("logs a deferred task that throws and runs the others", () => {
    const { comms, log } = recordingComms();
    const ran: string[] = [];
    comms.holdDeferred(true);
    comms.defer({}, () => {
      throw new Error("boom");
    });
    comms.defer({}, () => ran.push("second"));
    comms.settle();
    comms.holdDeferred(false);
    expect(ran).toEqual(["second"]);
    expect(log[0]).toMatch(/^deferred work failed: Error: boom/);
  });
});
