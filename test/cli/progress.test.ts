import { Writable } from 'node:stream';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { progressReporter } from '../../src/cli/progress.js';

/** A stream that records what is written to it, posing as a terminal or not. */
function fakeStream(isTTY: boolean): { stream: NodeJS.WriteStream; text: () => string } {
  const chunks: string[] = [];
  const stream = new Writable({
    write(chunk, _encoding, done) {
      chunks.push(String(chunk));
      done();
    },
  }) as unknown as NodeJS.WriteStream;
  Object.assign(stream, { isTTY, columns: 100 });
  return { stream, text: () => chunks.join('') };
}

function runStages(onProgress: (stage: string, done: number, total: number) => void): void {
  onProgress('stations', 0, 20);
  onProgress('stations', 20, 20);
  onProgress('transects', 0, 1228);
  onProgress('transects', 1228, 1228);
  onProgress('solve', 0, 2456);
  onProgress('solve', 2456, 2456);
  onProgress('strips', 0, 1);
  onProgress('strips', 1, 1);
}

afterEach(() => {
  vi.unstubAllEnvs();
});

describe('progressReporter', () => {
  it('draws the stage and its count on a terminal, and clears the line at the end', () => {
    vi.stubEnv('CI', '');
    const { stream, text } = fakeStream(true);
    const reporter = progressReporter({ quiet: false, stream });
    runStages(reporter.onProgress);
    reporter.stop();
    const written = text();
    expect(written).toMatch(/doab stations \[[^\]]*\] 0\/20/);
    expect(written).toMatch(/doab transects \[[^\]]*\] 0\/1228/);
    expect(written).toMatch(/doab solve \[[^\]]*\] 0\/2456/);
    expect(written).toMatch(/doab strips \[[^\]]*\] 1\/1/);
    // clearOnComplete: the last thing written erases the line (ESC [ 2K or ESC [ 0K)
    expect(written).toMatch(/\u001b\[[02]?K[^\u001b]*$/);
    reporter.stop();
  });

  it('writes nothing when the stream is not a terminal', () => {
    vi.stubEnv('CI', '');
    const { stream, text } = fakeStream(false);
    const reporter = progressReporter({ quiet: false, stream });
    runStages(reporter.onProgress);
    reporter.stop();
    expect(text()).toBe('');
  });

  it('writes nothing when quiet or under CI, even on a terminal', () => {
    vi.stubEnv('CI', '');
    const quiet = fakeStream(true);
    const a = progressReporter({ quiet: true, stream: quiet.stream });
    runStages(a.onProgress);
    a.stop();
    expect(quiet.text()).toBe('');

    vi.stubEnv('CI', 'true');
    const ci = fakeStream(true);
    const b = progressReporter({ quiet: false, stream: ci.stream });
    runStages(b.onProgress);
    b.stop();
    expect(ci.text()).toBe('');
  });
});
