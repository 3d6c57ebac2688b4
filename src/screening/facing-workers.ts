// The transect solve over worker threads: contiguous chunks of facings go to node:worker_threads
// workers, each of which solves them with the same solveFacingRange as a run in process, writing
// the results at their chunk's place in columns in shared memory. This thread solves chunks too
// between messages (so N workers are this thread and N - 1 started ones), and blocks
// (Atomics.wait) only when none is left, so the pipeline stays synchronous; messages are taken
// with receiveMessageOnPort.
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { MessageChannel, Worker, receiveMessageOnPort, type MessagePort } from 'node:worker_threads';
import type { FacingTable, LineTable, StationTable } from '../geometry/index.js';
import type { LineRecord, ZoneRecord } from './district-inputs.js';
import { emptyResults, resetResults, resultsRange, type FacingInputs, type FacingResults, type SolveContext, type StationInputs } from './facing-columns.js';
import { castIndexOf, sharedCastIndex, type CastIndex, type SharedCastIndex } from '../geometry/transects.js';
import { castTransects } from '../geometry/index.js';
import { newColumn } from '../shared/columns.js';

/**
 * Fewer facings than this are solved in process: starting a worker and building its zone index
 * costs about 0.1 s, which the solve of 50,000 facings over simple zones (about 2 us each,
 * measured with bench/screen.bench.ts) would not repay. DOAB_WORKER_MIN_FACINGS overrides it
 * (tests set it low so that small districts go through the workers).
 */
export const WORKER_MIN_FACINGS = 50_000;
/** Largest chunk of facings sent at once (even, so a chunk holds whole stations). */
const MAX_CHUNK_FACINGS = 1 << 15;

/** Counts of worker runs in this process, for tests that must know the workers ran. */
export const facingWorkerStats = { runs: 0, threads: 0, chunks: 0, threadChunks: 0, threadCastChunks: 0 };

/** Workers for a solve of `facings` facings: the setting (null for the machine's cores), 1 below the threshold. */
export function workerCount(setting: number | null, facings: number): number {
  const wanted = setting ?? availableParallelism();
  const override = process.env.DOAB_WORKER_MIN_FACINGS;
  const minFacings = override === undefined || override === '' ? WORKER_MIN_FACINGS : Number(override);
  if (!(minFacings >= 0)) throw new Error(`Unexpected DOAB_WORKER_MIN_FACINGS value: ${override}.`);
  if (wanted <= 1 || facings < minFacings || facings < 4) return 1;
  return Math.min(wanted, Math.floor(facings / 2));
}

/** What a worker is started with (workerData). */
export interface FacingWorkerData {
  lines: LineRecord[];
  lineLengthsM: Float64Array;
  zones: ZoneRecord[];
  zonePolygons: SolveContext['zoneIndex']['polygons'];
  settings: SolveContext['settings'];
  port: MessagePort;
  /** Int32 counter a worker bumps (and notifies) after each message it posts. */
  signal: SharedArrayBuffer;
  /** When the workers cast the transects too: the lines and their segments' index (in shared memory) and the cast's options. */
  cast: (CastWork & { segments: SharedCastIndex }) | null;
  /** The whole run's columns in shared memory, which each chunk's casting and solve are written into. */
  into: ChunkTarget;
}

/** Where chunks are written: the run's result columns, and its facing columns when the chunks are cast. */
export interface ChunkTarget {
  results: FacingResults;
  facings: FacingTable | null;
}

/** Casting in the workers: the lines' table and the options every chunk is cast with. */
export interface CastWork {
  lineTable: LineTable;
  options: { maxGapM: number; maxAngleDeg: number; halfWindowM: number };
}

/**
 * A chunk of work: facings start .. start + 2 n - 1 of n stations, with their stations' columns,
 * and their facings' columns; or, when the worker is to cast them first, none (and every station column).
 */
export interface FacingChunk {
  start: number;
  stations: StationInputs | StationTable;
  facings: FacingInputs | null;
}

export type FacingWorkerReply = { ready: true } | { start: number; count: number; cast: boolean } | { error: string };

const STATION_COLUMNS = ['x', 'y', 'line', 'chainageM'] as const;
const CAST_STATION_COLUMNS = ['line', 'part', 'chainageM', 'x', 'y', 'dirX', 'dirY', 'lengthM'] as const;
/** The facing columns castTransects fills, in its table's order. */
const CAST_FACING_COLUMNS = ['partner', 'reason', 'transectLengthM', 'endX', 'endY', 'partnerChainageM', 'angleDeg', 'hitLine', 'partnerSide'] as const;

/** The line table in shared memory (as it is, when it is there already): every worker reads the one copy. */
function sharedLineTable(t: LineTable): LineTable {
  const share = <T extends Float64Array | Uint32Array>(column: T): T => {
    if (column.buffer instanceof SharedArrayBuffer) return column;
    const shared = new (column.constructor as { new (buffer: SharedArrayBuffer): T })(new SharedArrayBuffer(column.byteLength));
    shared.set(column);
    return shared;
  };
  return { lineCount: t.lineCount, ids: [], linePartStart: share(t.linePartStart), partVertexStart: share(t.partVertexStart), partLine: share(t.partLine), chainageM: share(t.chainageM), x: share(t.x), y: share(t.y) };
}

/**
 * Casts the chunk's transects (when it carries no facings) and solves them, writing both into the
 * run's columns at the chunk's place: the one function a worker and this thread run on a chunk, so
 * that either gives the same columns. Returns the chunk's facing count and whether it was cast.
 */
export function workOnChunk(
  chunk: FacingChunk,
  cast: { lineTable: LineTable; options: CastWork['options']; index: () => CastIndex } | null,
  solve: (stations: StationInputs, facings: FacingInputs, results: FacingResults) => void,
  into: ChunkTarget,
): { count: number; cast: boolean } {
  let facings: FacingInputs;
  if (chunk.facings === null) {
    if (!cast || !into.facings) throw new Error('Unexpected chunk to cast without the lines.');
    const stations = chunk.stations as StationTable;
    const count = 2 * stations.x.length;
    const views = Object.fromEntries(CAST_FACING_COLUMNS.map((key) => [key, (into.facings![key] as Float64Array).subarray(chunk.start, chunk.start + count)]));
    facings = castTransects(cast.lineTable, { ...stations, count: stations.x.length }, { ...cast.options, index: cast.index(), into: { count, ...views } as unknown as FacingTable });
  } else facings = chunk.facings;
  const count = facings.reason.length;
  const results = resultsRange(into.results, chunk.start, count);
  resetResults(results, facings.reason);
  solve(chunk.stations, facings, results);
  return { count, cast: chunk.facings === null };
}
const FACING_COLUMNS = ['reason', 'endX', 'endY', 'partner', 'partnerChainageM', 'transectLengthM'] as const;

/**
 * The worker's module, always the compiled one: next to this module in dist/, or under dist/ when
 * this module runs from its TypeScript source (vitest, tsx), whose tests build dist/ first. A
 * worker started through the tsx loader hangs while this thread waits on it (Node 20).
 */
function workerEntry(): URL {
  return import.meta.url.endsWith('.ts') ? new URL('../../dist/screening/facing-worker.js', import.meta.url) : new URL('./facing-worker.js', import.meta.url);
}

/** How long a worker may take to start and build its zone index before the run gives up on it (ms). */
const START_TIMEOUT_MS = 60_000;

/**
 * Solves the facings over worker threads; with `facings` a CastWork instead of a table, the
 * workers cast the transects of their chunk of stations first. Returns the results and the
 * facings (as given, or cast).
 */
export function solveInWorkers(
  context: SolveContext,
  stations: StationTable,
  facingsOrCast: FacingTable | CastWork,
  workerTotal: number,
  onProgress: (done: number) => void,
  solveChunk: (context: SolveContext, stations: StationInputs, facings: FacingInputs, results: FacingResults) => void,
): { results: FacingResults; facings: FacingTable } {
  const castWork = 'lineTable' in facingsOrCast ? facingsOrCast : null;
  const given = castWork ? null : (facingsOrCast as FacingTable);
  const n = 2 * stations.count;
  if (given && given.count !== n) throw new Error(`Unexpected ${given.count} facings for ${stations.count} stations.`);
  // the lines and their segments' index in shared memory: one copy for every thread
  const sharedTable = castWork ? sharedLineTable(castWork.lineTable) : null;
  const cast = castWork && sharedTable ? { lineTable: sharedTable, options: castWork.options, segments: sharedCastIndex(sharedTable) } : null;
  let ownIndex: CastIndex | null = null;
  const ownCast = cast ? { ...cast, index: () => (ownIndex ??= castIndexOf(cast.segments)) } : null;
  // the run's columns in shared memory: every thread writes its chunks there, nothing is copied back
  const facings: FacingTable = given ?? {
    count: n,
    partner: newColumn(Int32Array, n, true),
    reason: newColumn(Uint8Array, n, true),
    transectLengthM: newColumn(Float64Array, n, true),
    endX: newColumn(Float64Array, n, true),
    endY: newColumn(Float64Array, n, true),
    partnerChainageM: newColumn(Float64Array, n, true),
    angleDeg: newColumn(Float64Array, n, true),
    hitLine: newColumn(Int32Array, n, true),
    partnerSide: newColumn(Uint8Array, n, true),
  };
  // about eight chunks a worker, so that one slow region does not hold the others up
  const chunkFacings = Math.min(MAX_CHUNK_FACINGS, Math.max(2, 2 * Math.ceil(n / (16 * workerTotal))));
  const chunkTotal = Math.ceil(n / chunkFacings);
  // every facing is set by its chunk
  const results = emptyResults(given ? given.reason : new Uint8Array(n), false, true);
  const into: ChunkTarget = { results, facings: given ? null : facings };
  const signal = new SharedArrayBuffer(4);
  const counter = new Int32Array(signal);
  // the workers need each line's stage and bed, not its geometry or attributes
  const lines = context.lines.map((line) => ({ ...line, partsLonLat: [], properties: {} }));
  const zones = context.zones.map((zone) => ({ ...zone, polygonsLonLat: [] }));
  const entry = workerEntry();
  // a worker whose module is missing fails where this thread, blocked below, would never hear of it
  if (!existsSync(fileURLToPath(entry))) throw new Error(`The transect-solve worker is missing: ${fileURLToPath(entry)} (build dist/ with npm run build).`);
  const workers: { worker: Worker; port: MessagePort; ready: boolean }[] = [];
  let next = 0, done = 0, doneFacings = 0, threadChunks = 0;
  const takeChunk = (): FacingChunk => {
    const start = next * chunkFacings, end = Math.min(n, start + chunkFacings);
    next++;
    if (!given) {
      const columns = Object.fromEntries(CAST_STATION_COLUMNS.map((key) => [key, stations[key].slice(start >> 1, (end + 1) >> 1)]));
      return { start, stations: { count: (end - start) >> 1, ...columns } as unknown as StationTable, facings: null };
    }
    return {
      start,
      stations: Object.fromEntries(STATION_COLUMNS.map((key) => [key, stations[key].slice(start >> 1, (end + 1) >> 1)])) as unknown as StationInputs,
      facings: Object.fromEntries(FACING_COLUMNS.map((key) => [key, given[key].slice(start, end)])) as unknown as FacingInputs,
    };
  };
  const send = (slot: (typeof workers)[number]): void => {
    if (next >= chunkTotal) return;
    const chunk = takeChunk();
    const transfer = [...Object.values(chunk.stations), ...Object.values(chunk.facings ?? {})].filter((column) => typeof column === 'object').map((column) => (column as Float64Array).buffer as ArrayBuffer);
    slot.port.postMessage(chunk, transfer);
  };
  try {
    for (let w = 1; w < workerTotal; w++) {
      const { port1, port2 } = new MessageChannel();
      const workerData: FacingWorkerData = { lines, lineLengthsM: context.lineLengthsM, zones, zonePolygons: context.zoneIndex.polygons, settings: context.settings, port: port2, signal, cast, into };
      const worker = new Worker(entry, { workerData, transferList: [port2] });
      worker.unref();
      workers.push({ worker, port: port1, ready: false });
    }
    // two chunks in hand per worker, so none waits for the next while this thread copies
    for (let round = 0; round < 2; round++) for (const slot of workers) send(slot);
    onProgress(0);
    const startedAt = Date.now();
    while (done < chunkTotal) {
      const seen = Atomics.load(counter, 0);
      let received = false;
      for (const slot of workers) {
        for (let message = receiveMessageOnPort(slot.port); message !== undefined; message = receiveMessageOnPort(slot.port)) {
          received = true;
          const reply = message.message as FacingWorkerReply;
          if ('error' in reply) throw new Error(`A transect-solve worker failed: ${reply.error}`);
          if ('ready' in reply) {
            slot.ready = true;
            continue;
          }
          if (reply.cast) facingWorkerStats.threadCastChunks++;
          threadChunks++;
          done++;
          doneFacings += reply.count;
          onProgress(doneFacings);
          send(slot);
        }
      }
      // a worker bumps the counter after posting; the timeout only guards against a lost wake-up
      if (!received && next < chunkTotal) {
        const chunk = takeChunk();
        const own = workOnChunk(chunk, ownCast, (s, f, r) => solveChunk(context, s, f, r), into);
        done++;
        doneFacings += own.count;
        onProgress(doneFacings);
      } else if (!received) Atomics.wait(counter, 0, seen, 1000);
      if (Date.now() - startedAt > START_TIMEOUT_MS && !workers.every((slot) => slot.ready)) {
        throw new Error(`A transect-solve worker did not start within ${START_TIMEOUT_MS / 1000} s; --workers 1 solves in this thread.`);
      }
    }
  } finally {
    for (const { worker, port } of workers) {
      port.close();
      void worker.terminate();
    }
  }
  facingWorkerStats.runs++;
  facingWorkerStats.threads += workerTotal - 1;
  facingWorkerStats.chunks += chunkTotal;
  facingWorkerStats.threadChunks += threadChunks;
  onProgress(n);
  return { results, facings };
}

