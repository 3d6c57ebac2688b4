// A transect-solve worker (started by facing-workers.ts): builds the zone index once from the
// zone polygons, then casts (when asked, against the lines and their index in shared memory) and
// solves each chunk it is sent with the same code as the main thread, writing into the run's
// columns in shared memory, and posts back only the chunk's place. Modules are imported inside
// the try, so that a failure to load is reported to the waiting thread rather than lost.
import { workerData } from 'node:worker_threads';
import type { FacingChunk, FacingWorkerData, FacingWorkerReply } from './facing-workers.js';

const data = workerData as FacingWorkerData;
const counter = new Int32Array(data.signal);
const reply = (message: FacingWorkerReply, transfer: ArrayBuffer[] = []): void => {
  data.port.postMessage(message, transfer);
  Atomics.add(counter, 0, 1);
  Atomics.notify(counter, 0);
};

try {
  const { buildZoneIndex } = await import('../geometry/index.js');
  const { solveFacingRange } = await import('./solve-facings.js');
  const { workOnChunk } = await import('./facing-workers.js');
  const { castIndexOf } = await import('../geometry/transects.js');
  const context = { lines: data.lines, lineLengthsM: data.lineLengthsM, zones: data.zones, zoneIndex: buildZoneIndex(data.zonePolygons), settings: data.settings };
  // the segments' index is the one the main thread built, in shared memory, opened when the first chunk to cast comes
  const cast = data.cast;
  let index: ReturnType<typeof castIndexOf> | null = null;
  const castWith = cast ? { ...cast, index: () => (index ??= castIndexOf(cast.segments)) } : null;
  reply({ ready: true });
  data.port.on('message', (chunk: FacingChunk) => {
    try {
      // the chunk is written straight into the run's shared columns: only its place goes back
      const done = workOnChunk(chunk, castWith, (stations, columns, results) => solveFacingRange(context, stations, columns, results), data.into);
      reply({ start: chunk.start, ...done });
    } catch (error) {
      reply({ error: (error as Error).stack ?? String(error) });
    }
  });
} catch (error) {
  reply({ error: (error as Error).stack ?? String(error) });
}
