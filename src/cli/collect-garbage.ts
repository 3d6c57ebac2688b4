// A full garbage collection between the stages of a large run (screening, then writing). V8 lets
// garbage grow with the live heap before it collects it, and the writing began with the
// screening's garbage still held: at a million stations that put 100 to 200 MB on the run's peak.
// Small runs skip it; at a million stations it takes a few tenths of a second.
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';

/** Runs at or above this many stations collect between stages. */
export const COLLECT_FROM_STATIONS = 200_000;

let collect: (() => void) | null | undefined;

/** Collects the garbage now when the run has at least COLLECT_FROM_STATIONS stations; true when it did. */
export function collectBetweenStages(stations: number): boolean {
  if (stations < COLLECT_FROM_STATIONS) return false;
  if (collect === undefined) {
    // the collector's own entry point, made available to a new context once the flag is set
    // [from memory: Node's v8.setFlagsFromString documentation and V8's --expose-gc flag]
    try {
      setFlagsFromString('--expose-gc');
      const entry: unknown = runInNewContext('gc');
      collect = typeof entry === 'function' ? (entry as () => void) : null;
    } catch {
      collect = null;
    }
  }
  if (!collect) return false;
  collect();
  return true;
}
