/**
 * A single-node Slurm of the test's own on this machine: a munge daemon with its own key and
 * socket, slurmctld and slurmd with a configuration in a temporary directory (localhost, free
 * ports, no cgroups: process tracking by /proc, no task plugin, no accounting), started as the
 * packages' programs are, and stopped by the pids they wrote — nothing else on the machine is
 * touched. Needs root and Debian's slurm-wlm and munge (scripts/ensure-system-deps.sh installs
 * them); when they are not there, starting fails and says why.
 */
import { spawnSync } from "node:child_process";
import { chmodSync, chownSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { createServer } from "node:net";
import { hostname, tmpdir } from "node:os";
import { join } from "node:path";

export interface LocalSlurm {
  /** The directory of the configuration, state and logs. */
  readonly dir: string;
  /** SLURM_CONF for the client commands (sbatch, squeue, scancel) and the jobs. */
  readonly conf: string;
  /** Stops exactly the daemons this started, by pid, and removes the directory. */
  stop(): Promise<void>;
}

const PROGRAMS = ["munged", "mungekey", "slurmctld", "slurmd", "sbatch", "squeue", "sinfo", "scancel"];

export async function startLocalSlurm(): Promise<LocalSlurm> {
  if (process.getuid?.() !== 0) {
    throw new Error("the local Slurm needs root (slurmd starts the jobs; SlurmUser is root): run the integration suites as root, as .ci/run does");
  }
  const missing = PROGRAMS.filter((p) => spawnSync("sh", ["-c", `command -v ${p}`]).status !== 0);
  if (missing.length > 0) {
    throw new Error(`${missing.join(", ")} not installed: scripts/ensure-system-deps.sh installs Debian's slurm-wlm and munge (npm test and npm run test:integration run it)`);
  }
  const munge = userIds("munge");
  const dir = mkdtempSync(join(tmpdir(), "quietframe-slurm-"));
  chmodSync(dir, 0o755);
  const pidFiles: string[] = [];
  const local: LocalSlurm = { dir, conf: join(dir, "slurm.conf"), stop: () => stopDaemons(pidFiles, dir) };
  try {
    // munge: its own key and socket, run as the munge user (munged refuses to run as root); clients need x on the socket directory.
    const mungeDir = join(dir, "munge");
    mkdirSync(mungeDir, { mode: 0o755 });
    chownSync(mungeDir, munge.uid, munge.gid);
    const key = join(mungeDir, "munge.key");
    run("mungekey", ["--create", `--keyfile=${key}`]);
    chownSync(key, munge.uid, munge.gid);
    chmodSync(key, 0o400);
    const socket = join(mungeDir, "munge.socket");
    pidFiles.push(join(mungeDir, "munged.pid"));
    run("munged", [`--socket=${socket}`, `--key-file=${key}`, `--pid-file=${pidFiles[0]}`, `--log-file=${join(mungeDir, "munged.log")}`, `--seed-file=${join(mungeDir, "munged.seed")}`], munge);

    const node = hostname().split(".")[0];
    const [ctldPort, dPort] = [await freePort(), await freePort()];
    for (const d of ["state", "spool"]) mkdirSync(join(dir, d));
    const conf = [
      "ClusterName=quietframe-test",
      `SlurmctldHost=${node}`,
      "SlurmUser=root",
      "SlurmdUser=root",
      "AuthType=auth/munge",
      "CredType=cred/munge",
      `AuthInfo=socket=${socket}`,
      `StateSaveLocation=${join(dir, "state")}`,
      `SlurmdSpoolDir=${join(dir, "spool")}`,
      `SlurmctldPidFile=${join(dir, "slurmctld.pid")}`,
      `SlurmdPidFile=${join(dir, "slurmd.pid")}`,
      `SlurmctldLogFile=${join(dir, "slurmctld.log")}`,
      `SlurmdLogFile=${join(dir, "slurmd.log")}`,
      "ProctrackType=proctrack/linuxproc",
      "TaskPlugin=task/none",
      "JobAcctGatherType=jobacct_gather/none",
      "SchedulerType=sched/backfill",
      "SelectType=select/cons_tres",
      "SelectTypeParameters=CR_Core",
      "ReturnToService=2",
      "MpiDefault=none",
      // scancel: SIGTERM, then SIGKILL after this many seconds.
      "KillWait=5",
      `SlurmctldPort=${ctldPort}`,
      `SlurmdPort=${dPort}`,
      `NodeName=${node} CPUs=2 RealMemory=4000 State=UNKNOWN`,
      `PartitionName=debug Nodes=${node} Default=YES MaxTime=INFINITE State=UP`,
      "",
    ].join("\n");
    writeFileSync(local.conf, conf);
    const env = { ...process.env, SLURM_CONF: local.conf };
    pidFiles.push(join(dir, "slurmctld.pid"));
    run("slurmctld", ["-f", local.conf], undefined, env);
    pidFiles.push(join(dir, "slurmd.pid"));
    run("slurmd", ["-f", local.conf], undefined, env);
    await waitFor(
      () => spawnSync("sinfo", ["--noheader", "--format=%t"], { encoding: "utf8", env }).stdout?.trim() === "idle",
      30_000,
      () => `the node never showed idle in sinfo:\n${tail(join(dir, "slurmctld.log"))}\n${tail(join(dir, "slurmd.log"))}`,
    );
    return local;
  } catch (e) {
    await local.stop();
    throw e;
  }
}

function userIds(name: string): { uid: number; gid: number } {
  const uid = spawnSync("id", ["-u", name], { encoding: "utf8" });
  const gid = spawnSync("id", ["-g", name], { encoding: "utf8" });
  if (uid.status !== 0 || gid.status !== 0) throw new Error(`there is no "${name}" user: Debian's munge package creates it (scripts/ensure-system-deps.sh)`);
  return { uid: Number(uid.stdout), gid: Number(gid.stdout) };
}

function run(program: string, args: string[], as?: { uid: number; gid: number }, env: NodeJS.ProcessEnv = process.env): void {
  const r = spawnSync(program, args, { encoding: "utf8", env, ...(as ?? {}) });
  if (r.error || r.status !== 0) throw new Error(`${program} ${args.join(" ")} failed: ${r.error?.message ?? ""}${r.stderr}${r.stdout}`);
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(0, "0.0.0.0", () => {
      const address = server.address();
      const port = typeof address === "object" && address ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}

/** Polls `done` every 200 ms; rejects with `why()` after `ms`. */
export async function waitFor(done: () => boolean, ms: number, why: () => string): Promise<void> {
  const until = Date.now() + ms;
  while (!done()) {
    if (Date.now() > until) throw new Error(why());
    await new Promise((r) => setTimeout(r, 200));
  }
}

function tail(file: string): string {
  return existsSync(file) ? readFileSync(file, "utf8").split("\n").slice(-15).join("\n") : `(no ${file})`;
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** SIGTERM to each daemon this started (slurmd, slurmctld, munged: the reverse of starting), SIGKILL if it lingers. */
async function stopDaemons(pidFiles: readonly string[], dir: string): Promise<void> {
  for (const file of [...pidFiles].reverse()) {
    if (!existsSync(file)) continue;
    const pid = Number(readFileSync(file, "utf8").trim());
    if (!Number.isInteger(pid) || pid <= 1 || !alive(pid)) continue;
    process.kill(pid, "SIGTERM");
    try {
      await waitFor(
        () => !alive(pid),
        10_000,
        () => `pid ${pid} did not stop`,
      );
    } catch {
      process.kill(pid, "SIGKILL");
    }
  }
  rmSync(dir, { recursive: true, force: true });
}
