/**
 * Zip reading and writing for project archives (fflate). Reading decompresses only the entries asked
 * for, streaming, with a running byte count: an entry whose header lies about its size stops at the cap
 * instead of filling memory. Entries are found by exact path in a Map (a name like "__proto__" is an
 * ordinary name). Writing dates every entry with the given time, so the bytes are reproducible.
 */
import { Unzip, UnzipInflate, Zip, ZipDeflate } from 'fflate';
import { BorewaveError } from '../../errors';

/** Limits that keep a hostile archive from exhausting memory (a zip bomb must fail cleanly). */
export const ARCHIVE_LIMITS = {
  maxEntries: 5000,
  maxEntryBytes: 256 * 1024 * 1024,
  maxTotalBytes: 1024 * 1024 * 1024,
};

/** Compressed bytes handed to the inflater at a time: bounds what one step can produce (~1000:1 at most). */
const PUSH_BYTES = 16 * 1024;

export function isZip(bytes: Uint8Array): boolean {
  return bytes.length >= 22 && bytes[0] === 0x50 && bytes[1] === 0x4b;
}

export function entryPath(name: string): string {
  return name.replace(/\\/g, '/');
}

export interface ZipRead {
  /** Every entry name in the archive (folders left out), in archive order. */
  names: string[];
  /** The wanted entries' bytes by path. */
  entries: Map<string, Uint8Array>;
}

/** Reads the entries `wanted` accepts (by normalised path); others are skipped without inflating. */
export function readZip(
  zip: Uint8Array,
  archiveName: string,
  wanted: (path: string) => boolean,
  limits = ARCHIVE_LIMITS,
): ZipRead {
  if (!isZip(zip)) throw new BorewaveError('ARCHIVE_NOT_ZIP', `${archiveName} is not a zip archive.`, archiveName);
  const names: string[] = [];
  const entries = new Map<string, Uint8Array>();
  let total = 0;
  const unzip = new Unzip();
  unzip.register(UnzipInflate);
  unzip.onfile = (file) => {
    const path = entryPath(file.name);
    if (path.endsWith('/')) return;
    names.push(path);
    if (names.length > limits.maxEntries)
      throw new BorewaveError(
        'ARCHIVE_TOO_MANY_ENTRIES',
        `${archiveName} holds more than ${limits.maxEntries} files.`,
        archiveName,
      );
    if (!wanted(path)) return;
    if (file.originalSize !== undefined && file.originalSize > limits.maxEntryBytes)
      throw new BorewaveError(
        'ARCHIVE_ENTRY_TOO_LARGE',
        `${path} in ${archiveName} declares ${file.originalSize} bytes, above the ${limits.maxEntryBytes} limit.`,
        archiveName,
        path,
      );
    const chunks: Uint8Array[] = [];
    let size = 0;
    file.ondata = (err, chunk, final) => {
      if (err) throw err;
      size += chunk.length;
      total += chunk.length;
      if (size > limits.maxEntryBytes)
        throw new BorewaveError(
          'ARCHIVE_ENTRY_TOO_LARGE',
          `${path} in ${archiveName} unpacks to more than ${limits.maxEntryBytes} bytes.`,
          archiveName,
          path,
        );
      if (total > limits.maxTotalBytes)
        throw new BorewaveError(
          'ARCHIVE_TOO_LARGE',
          `${archiveName} unpacks to more than ${limits.maxTotalBytes} bytes.`,
          archiveName,
        );
      chunks.push(chunk);
      if (final) {
        if (file.originalSize !== undefined && file.originalSize !== size)
          throw new BorewaveError(
            'ARCHIVE_CORRUPT',
            `${path} in ${archiveName} declares ${file.originalSize} bytes but holds ${size}.`,
            archiveName,
            path,
          );
        const out = new Uint8Array(size);
        let at = 0;
        for (const c of chunks) {
          out.set(c, at);
          at += c.length;
        }
        if (entries.has(path))
          throw new BorewaveError('ARCHIVE_DUPLICATE_FILE', `${archiveName} holds "${path}" twice.`, archiveName, path);
        entries.set(path, out);
      }
    };
    file.start();
  };
  try {
    for (let i = 0; i < zip.length; i += PUSH_BYTES) {
      const end = Math.min(zip.length, i + PUSH_BYTES);
      unzip.push(zip.subarray(i, end), end === zip.length);
    }
  } catch (e) {
    if (e instanceof BorewaveError) throw e;
    throw new BorewaveError(
      'ARCHIVE_CORRUPT',
      `${archiveName} could not be unpacked: ${(e as Error).message}.`,
      archiveName,
    );
  }
  return { names, entries };
}

/** DOS date fields from the UTC fields of an ISO time (zip times carry no zone); 1980 at the earliest. */
function zipTime(iso: string): Date {
  const t = new Date(iso);
  const u = Number.isFinite(t.getTime()) && t.getUTCFullYear() >= 1980 ? t : new Date(Date.UTC(1980, 0, 1));
  return new Date(
    u.getUTCFullYear(),
    u.getUTCMonth(),
    u.getUTCDate(),
    u.getUTCHours(),
    u.getUTCMinutes(),
    u.getUTCSeconds(),
  );
}

/** A zip of the entries in the given order, every entry dated `savedAt` (byte-reproducible). */
export function writeZip(entries: readonly { path: string; bytes: Uint8Array }[], savedAt: string): Uint8Array {
  // The streaming writer takes names one by one (never as object keys), so "__proto__" is stored as named.
  const chunks: Uint8Array[] = [];
  const zip = new Zip((err, data) => {
    if (err) throw err;
    chunks.push(data);
  });
  const mtime = zipTime(savedAt);
  for (const e of entries) {
    const f = new ZipDeflate(e.path, { level: 6 });
    f.mtime = mtime;
    zip.add(f);
    f.push(e.bytes, true);
  }
  zip.end();
  const out = new Uint8Array(chunks.reduce((n, c) => n + c.length, 0));
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}
