import { describe, expect, it } from "vitest";
import { runCli } from "../../src/cli/run";

// `quietframe extension install | remove`: the options it refuses, before anything is touched.
// Installing and removing the built extension, and JupyterLab listing it, are checked in
// test/browser/jupyter-front-ends.test.ts (it needs the built extension and a JupyterLab).

function run(args: string[]): { code: number; err: string; out: string } {
  const out: string[] = [];
  const err: string[] = [];
  const code = runCli(args, { out: (s) => out.push(s), err: (s) => err.push(s) });
  return { code, err: err.join(""), out: out.join("") };
}

describe("quietframe extension", () => {
  it("refuses an unknown subcommand and names the allowed ones", () => {
    expect(run(["extension", "uninstall"])).toEqual({
      code: 1,
      out: "",
      err: 'quietframe: extension = "uninstall": is not an extension subcommand (did you mean "install"?); allowed: install, remove\n',
    });
  });

  it("refuses more than one place to install to", () => {
    const r = run(["extension", "remove", "--user", "--prefix", "somewhere"]);
    expect(r.code).toBe(1);
    expect(r.out).toBe("");
    expect(r.err).toBe('quietframe: extension = "--user --prefix": names more than one place; allowed: one of --sys-prefix, --user or --prefix DIR\n');
  });

  it("is described in the usage text", () => {
    const r = run(["help"]);
    expect(r.out).toContain("quietframe extension install [--sys-prefix | --user | --prefix DIR] [--python PATH]");
    expect(r.out).toContain("quietframe extension remove  [--sys-prefix | --user | --prefix DIR] [--python PATH]");
  });
});
