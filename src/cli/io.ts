/** Where a command writes: standard output and standard error, as sinks tests can replace. */
export interface CliIo {
  out: (s: string) => void;
  err: (s: string) => void;
}
