// A transect-solve worker (started by facing-workers.ts): builds the zone index once from the
// zone polygons, then solves each chunk of facings it is sent with solveFacingRange and posts the
// results back, their buffers transferred. Modules are imported inside the try, so that a failure
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
  const { emptyResults, solveFacingRange } = await import('./solve-facings.js');
  const context = { lines: data.lines, lineLengthsM: data.lineLengthsM, zones: data.zones, zoneIndex: buildZoneIndex(data.zonePolygons), settings: data.settings };
  reply({ ready: true });
  data.port.on('message', (chunk: FacingChunk) => {
    try {
      const results = emptyResults(chunk.facings.reason);
      solveFacingRange(context, chunk.stations, chunk.facings, results);
      reply({ start: chunk.start, results }, Object.values(results).map((column: Uint8Array) => column.buffer as ArrayBuffer));
    } catch (error) {
      reply({ error: (error as Error).stack ?? String(error) });
    }
  });
} catch (error) {
  reply({ error: (error as Error).stack ?? String(error) });
}
