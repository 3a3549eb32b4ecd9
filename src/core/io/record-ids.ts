/**
 * Unique record ids for files loaded together. Instruments restart their numbering per hole or per
 * day (1.dat, 2.dat ...), so two files may share a name: none may replace another. A file keeps its
 * name as id when the name is unique; files sharing a name are told apart by their folder (where a
 * folder was dropped or given), else by an order suffix "1 (2).dat". Ids already taken stay taken.
 * The id is also the file's path in a saved project (project format: files[].path, unique).
 */

export interface NamedFile {
  /** File name without folders. */
  name: string;
  /** Folder path it came from (relative, '/'-separated), '' when unknown. */
  folder?: string;
}

/** "1.sg2" -> "1 (2).sg2": the order suffix goes before the extension so the type stays readable. */
function withSuffix(name: string, taken: Set<string>): string {
  const slash = name.lastIndexOf('/');
  const dot = name.lastIndexOf('.');
  const cut = dot > slash + 1 ? dot : name.length;
  for (let k = 2; ; k++) {
    const id = `${name.slice(0, cut)} (${k})${name.slice(cut)}`;
    if (!taken.has(id)) return id;
  }
}

/** One id per file, in order; `taken` = ids already in the session (not reused). */
export function uniqueRecordIds(files: readonly NamedFile[], taken: Iterable<string> = []): string[] {
  const used = new Set(taken);
  const count = new Map<string, number>();
  for (const f of files) count.set(f.name, (count.get(f.name) ?? 0) + 1);
  return files.map((f) => {
    const clash = (count.get(f.name) ?? 0) > 1 || used.has(f.name);
    let id = f.name;
    if (clash && f.folder) id = `${f.folder.replace(/\/+$/, '')}/${f.name}`;
    if (used.has(id)) id = withSuffix(id, used);
    used.add(id);
    return id;
  });
}

/** Split a '/'- or '\'-separated path into folder and name. */
export function splitPath(path: string): NamedFile {
  const norm = path.replace(/\\/g, '/');
  const i = norm.lastIndexOf('/');
  return i < 0 ? { name: norm, folder: '' } : { name: norm.slice(i + 1), folder: norm.slice(0, i) };
}
