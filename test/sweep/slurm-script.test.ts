/**
 * The sbatch scripts' text. The directives are checked against Slurm's documented forms
 * (sbatch(1) of Slurm 22.05: --array with a "%N" limit on tasks at once, --time as "minutes",
 * "H:MM:SS" or "D-HH:MM:SS", --mem with a K/M/G/T suffix, --output with %a for the task and %j
 * for the job, --dependency=afterok:<job id>; from memory of that manual page).
 */
import { describe, expect, it } from "vitest";
import { QuietframeError } from "../../src/errors";
import { arrayList, checkSlurmRequest, chunkScript, mergeScript, shellWord, type ScriptContext } from "../../src/sweep";

const CTX: ScriptContext = {
  dir: "/shared/sweeps/membrane map",
  name: "membrane-map",
  fingerprint: `sha256:${"ab".repeat(32)}`,
  chunkCount: 12,
  command: ["/opt/node/bin/node", "/opt/quietframe/dist/src/cli/main.js"],
};
const REQUEST = { time: "2:00:00", mem: "3G", concurrency: 4, partition: "short", account: "optics-lab" };

describe("arrayList", () => {
  it("writes runs of chunks as ranges", () => {
    expect(arrayList([0, 1, 2, 3, 5, 9, 10, 11])).toBe("0-3,5,9-11");
    expect(arrayList([7])).toBe("7");
    expect(arrayList([4, 2, 3, 3])).toBe("2-4");
  });
});

describe("the array script", () => {
  const text = chunkScript(CTX, [0, 1, 2, 3, 5], REQUEST);
  const lines = text.split("\n");

  it("is a bash script whose directives ask for the array with its limit, time, memory, partition and account", () => {
    expect(lines[0]).toBe("#!/bin/bash");
    expect(lines).toContain("#SBATCH --array=0-3,5%4");
    expect(lines).toContain("#SBATCH --time=2:00:00");
    expect(lines).toContain("#SBATCH --mem=3G");
    expect(lines).toContain("#SBATCH --partition=short");
    expect(lines).toContain("#SBATCH --account=optics-lab");
    expect(lines).toContain("#SBATCH --job-name=qf-membrane-map");
    expect(lines).toContain("#SBATCH --output='/shared/sweeps/membrane map/slurm/chunk-%a.out'");
  });

  it("runs the chunk of its task through quietframe, the sweep directory quoted for the shell", () => {
    expect(lines).toContain("exec /opt/node/bin/node /opt/quietframe/dist/src/cli/main.js sweep run '/shared/sweeps/membrane map'");
    // Every directive comes before the first command: sbatch stops reading them there.
    const firstCommand = lines.findIndex((l) => l !== "" && !l.startsWith("#"));
    expect(lines.slice(firstCommand).some((l) => l.startsWith("#SBATCH"))).toBe(false);
    expect(text).toContain("sbatch --dependency=afterok:<that id> merge.sbatch");
  });

  it("limits the tasks at once to the chunks it has, and leaves out partition and account when not given", () => {
    const few = chunkScript(CTX, [7], { time: "30", mem: "500M", concurrency: 50 });
    expect(few).toContain("#SBATCH --array=7%1\n");
    expect(few).not.toContain("--partition");
    expect(few).not.toContain("--account");
  });
});

describe("the merge script", () => {
  it("merges the sweep directory with the same requests", () => {
    const text = mergeScript(CTX, REQUEST);
    expect(text).toContain("exec /opt/node/bin/node /opt/quietframe/dist/src/cli/main.js sweep merge '/shared/sweeps/membrane map'\n");
    expect(text).toContain("#SBATCH --time=2:00:00\n");
    expect(text).toContain("#SBATCH --partition=short\n");
    expect(text).toContain("--dependency=afterok:<array job id>");
  });
});

describe("requests are checked by option", () => {
  const refusal = (r: Partial<typeof REQUEST>): QuietframeError => {
    try {
      checkSlurmRequest({ ...REQUEST, ...r });
    } catch (e) {
      return e as QuietframeError;
    }
    throw new Error("accepted");
  };
  it.each([
    [{ time: "2 hours" }, "--time"],
    [{ time: "1:2:3:4" }, "--time"],
    [{ mem: "3 GB" }, "--mem"],
    [{ concurrency: 0 }, "--concurrency"],
    [{ partition: "short; rm -rf" }, "--partition"],
    [{ account: "" }, "--account"],
  ])("%o is refused as %s", (r, option) => {
    const e = refusal(r);
    expect(e).toBeInstanceOf(QuietframeError);
    expect(e.path).toBe(option);
    expect(e.allowed).toBeTruthy();
  });

  it("accepts Slurm's time forms", () => {
    for (const time of ["30", "30:00", "2:00:00", "1-0", "1-12:00", "1-12:00:00"]) expect(checkSlurmRequest({ ...REQUEST, time }).time).toBe(time);
  });
});

describe("shellWord", () => {
  it("leaves plain words and quotes the rest, quotes inside included (POSIX sh quoting)", () => {
    expect(shellWord("/a/b-c_d.js")).toBe("/a/b-c_d.js");
    expect(shellWord("it's here")).toBe(`'it'"'"'s here'`);
  });
});
