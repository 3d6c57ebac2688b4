// Writes a set of output files so that a failed or interrupted run leaves none of them half-written:
// every file goes to a temporary name in the output folder first, each write is checked to its last
// byte and synced, and all are renamed only when all are written. A failure, or SIGINT/SIGTERM while
// writing, removes the temporary files and leaves the earlier outputs as they were.
import { randomBytes } from 'node:crypto';
import { closeSync, fsyncSync, lstatSync, mkdirSync, openSync, readdirSync, renameSync, rmSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { DataError } from '../shared/errors.js';

/**
 * A file another library writes itself (a database): built at the temporary path the writer gives,
 * an empty file made for it, so it is never held in memory whole. It must write nothing beside
 * that path. Its errors carry a `code` as Node's do, or SQLite's (SQLITE_FULL, SQLITE_IOERR...).
 */
export interface BuiltFile {
  buildAt: (temporaryPath: string) => void;
}

export interface OutputFile {
  name: string;
  /** The text, or its pieces in order: a layer of a large district is written piece by piece, never held whole. */
  content: string | Uint8Array | Iterable<string | Uint8Array> | BuiltFile;
}

function isBuiltFile(content: OutputFile['content']): content is BuiltFile {
  return typeof (content as Partial<BuiltFile>).buildAt === 'function';
}

// `.<name>.doab-<pid>-<random>.tmp`: the random part keeps a stale file of an earlier run in the same
// process id (containers reuse PID 1) from ever colliding with this run's
const TEMPORARY = /^\.(.+)\.doab-\d+-[0-9a-f]+\.tmp$/;
// the form older doab versions used
const OLD_TEMPORARY = /^\.(.+)\.\d+\.tmp$/;

/** Temporary files an earlier, killed doab run left in the folder for these names: ours to remove. */
export function staleTemporaries(outDir: string, names: ReadonlySet<string>): string[] {
  let entries: string[];
  try {
    entries = readdirSync(outDir);
  } catch {
    return [];
  }
  return entries.filter((entry) => {
    const match = TEMPORARY.exec(entry) ?? OLD_TEMPORARY.exec(entry);
    if (!match || !names.has(match[1])) return false;
    try {
      return lstatSync(join(outDir, entry)).isFile();
    } catch {
      return false;
    }
  });
}

// one buffer every text piece that fits is encoded into: a piece's bytes are not left behind for
// the collector (at a million stations, tens of thousands of pieces, whose freed bytes the C
// allocator kept, about 100 MB)
const SCRATCH = Buffer.allocUnsafeSlow(1 << 20);
// UTF-8 takes at most 3 bytes per UTF-16 code unit, so a text this long always fits
const SCRATCH_CHARS = Math.floor(SCRATCH.length / 3);

function writeAll(fd: number, data: string | Uint8Array): void {
  const bytes = typeof data !== 'string' ? data : data.length <= SCRATCH_CHARS ? SCRATCH.subarray(0, SCRATCH.write(data, 'utf8')) : Buffer.from(data, 'utf8');
  let done = 0;
  // a short write (a full disk, a file-size limit) is not the end: go on until every byte is out or an error says why
  while (done < bytes.length) {
    const wrote = writeSync(fd, bytes, done, bytes.length - done);
    if (wrote <= 0) throw Object.assign(new Error('the write stopped short'), { code: 'ESHORTWRITE' });
    done += wrote;
  }
}

function describeCode(code: string): string {
  const known: Record<string, string> = {
    EFBIG: 'a file grew beyond the size the system allows',
    ENOSPC: 'the disk is full',
    SQLITE_FULL: 'the disk is full, or a file grew beyond the size the system allows',
    SQLITE_IOERR_WRITE: 'the system refused a write: a full disk, a quota or a file-size limit',
    SQLITE_IOERR_FSYNC: 'the system could not sync the file to disk',
    EDQUOT: 'the disk quota is used up',
    EACCES: 'no permission',
    EPERM: 'no permission',
    EROFS: 'the folder is on a read-only file system',
    EISDIR: 'a folder stands where a file is to go',
    ESHORTWRITE: 'a write stopped short',
  };
  return known[code] ? `${code}: ${known[code]}` : code;
}

const yieldToEvents = () => new Promise<void>((resolve) => setImmediate(resolve));

/**
 * Writes every file or none. `staleNames` are the names whose temporary files from an earlier,
 * killed run may be removed first. Returns the paths written.
 */
export async function writeAllOrNothing(outDir: string, files: OutputFile[], staleNames: ReadonlySet<string> = new Set(files.map((file) => file.name))): Promise<string[]> {
  try {
    mkdirSync(outDir, { recursive: true });
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const why = code === 'ENOTDIR' || code === 'EEXIST' ? 'a file stands where a folder is needed' : code === 'EACCES' || code === 'EPERM' ? 'no permission' : String(code ?? error);
    throw new DataError({ file: outDir }, `cannot create the output folder (${why})`);
  }
  for (const stale of staleTemporaries(outDir, staleNames)) rmSync(join(outDir, stale), { force: true });

  const suffix = `doab-${process.pid}-${randomBytes(4).toString('hex')}`;
  const temporaries = files.map((file) => join(outDir, `.${file.name}.${suffix}.tmp`));
  const removeTemporaries = () => {
    for (const temporary of temporaries) rmSync(temporary, { force: true });
  };
  // a signal while writing: remove what was begun, then die of the signal as the user asked
  const onSignal = (signal: NodeJS.Signals) => {
    removeTemporaries();
    process.removeListener('SIGINT', onSignal);
    process.removeListener('SIGTERM', onSignal);
    process.kill(process.pid, signal);
  };
  process.on('SIGINT', onSignal);
  process.on('SIGTERM', onSignal);
  try {
    for (let i = 0; i < files.length; i++) {
      const fd = openSync(temporaries[i], 'wx');
      try {
        const content = files[i].content;
        if (isBuiltFile(content)) content.buildAt(temporaries[i]);
        else if (typeof content === 'string' || content instanceof Uint8Array) writeAll(fd, content);
        else {
          let pieces = 0;
          for (const piece of content) {
            writeAll(fd, piece);
            // let a signal in now and then, so an interrupted run cleans up instead of finishing
            if (++pieces % 16 === 0) await yieldToEvents();
          }
        }
        fsyncSync(fd);
      } finally {
        closeSync(fd);
      }
      await yieldToEvents();
    }
  } catch (error) {
    process.removeListener('SIGINT', onSignal);
    process.removeListener('SIGTERM', onSignal);
    removeTemporaries();
    const code = (error as NodeJS.ErrnoException).code;
    if (typeof code === 'string') throw new DataError({ file: outDir }, `cannot write the outputs (${describeCode(code)}); nothing was written, earlier outputs are as they were`);
    throw error;
  }
  // a signal during the renames waits for them (they are synchronous), then finds nothing left to remove
  try {
    return files.map((file, i) => {
      const target = join(outDir, file.name);
      renameSync(temporaries[i], target);
      return target;
    });
  } finally {
    process.removeListener('SIGINT', onSignal);
    process.removeListener('SIGTERM', onSignal);
  }
}
