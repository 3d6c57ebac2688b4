/** Where a command's text goes: standard output for results, standard error for the log. */
export interface CliIo {
  out: (text: string) => void;
  err: (text: string) => void;
}
