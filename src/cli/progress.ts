// A progress bar on standard error while the screening stages run: the stage's name and its
// count. Only a person at a terminal sees it; logs, pipes, CI and --quiet get nothing at all.
import cliProgress from 'cli-progress';
import type { ProgressListener } from '../index.js';

export interface ProgressReporter {
  onProgress: ProgressListener;
  /** Clears the bar from the terminal; safe to call more than once, or when nothing was shown. */
  stop(): void;
}

const SILENT: ProgressReporter = { onProgress: () => {}, stop: () => {} };

export function progressReporter(options: { quiet: boolean; stream: NodeJS.WriteStream }): ProgressReporter {
  // a CI log keeps every redraw of a bar as a line of its own, so CI gets none even on a pseudo-terminal
  if (options.quiet || options.stream.isTTY !== true || process.env.CI) return SILENT;
  const bar = new cliProgress.SingleBar(
    {
      stream: options.stream,
      format: 'doab {stage} [{bar}] {value}/{total}',
      barsize: 30,
      hideCursor: true,
      clearOnComplete: true,
      // the pipeline is synchronous, so no timer can fire during a stage; stop() restores SIGINT handling
      gracefulExit: true,
    },
    cliProgress.Presets.shades_classic,
  );
  let stage: string | null = null;
  return {
    onProgress(name, done, total) {
      if (stage === null) {
        bar.start(total, done, { stage: name });
      } else if (name !== stage) {
        bar.setTotal(total);
        bar.update(done, { stage: name });
        // a new stage is drawn at once, not at the next throttled redraw
        bar.render();
      } else {
        bar.update(done);
      }
      stage = name;
    },
    stop() {
      if (stage !== null) bar.stop();
      stage = null;
    },
  };
}
