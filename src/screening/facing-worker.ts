// A transect-solve worker (started by facing-workers.ts): builds the zone index once from the
// zone polygons, then casts (when asked, against the lines and their index in shared memory) and solves each chunk
// it is sent with the same code as the main thread, and posts the results back, their buffers
// transferred. Modules are imported inside the try, so that a failure
// to load is reported to the waiting thread rather than lost.
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
      const { results, facings } = workOnChunk(chunk, castWith, (stations, columns, into) => solveFacingRange(context, stations, columns, into));
      const buffers = [...Object.values(results), ...(facings ? Object.values(facings).filter((column) => typeof column === 'object') : [])].map((column: Uint8Array) => column.buffer as ArrayBuffer);
      reply({ start: chunk.start, results, facings }, buffers);
    } catch (error) {
      reply({ error: (error as Error).stack ?? String(error) });
    }
  });
} catch (error) {
  reply({ error: (error as Error).stack ?? String(error) });
}
