/**
 * Sweep rows as Apache Parquet (written with hyparquet-writer, read back with hyparquet), resumable by
 * row groups. After each row group the file's footer is written anew, so the file on disk is a valid
 * Parquet file after every commit; the previous footer stays behind as dead bytes between row groups
 * (readers find everything through the last footer's offsets). A crash mid-commit leaves a torn tail:
 * resuming looks back from the end for the last footer that parses and carries this sweep's definition,
 * cuts the file there and carries on. The definition, version and shard are in the key–value metadata.
 */
import { closeSync, existsSync, fstatSync, ftruncateSync, openSync, readSync, renameSync, rmSync, writeSync } from "node:fs";
import { brotliCompressSync, brotliDecompressSync, constants as zlibConstants } from "node:zlib";
import { asyncBufferFromFile, parquetMetadata, parquetMetadataAsync, parquetReadObjects, type AsyncBuffer, type FileMetaData } from "hyparquet";
import { ByteWriter, ParquetWriter, schemaFromColumnData } from "hyparquet-writer";
import { CalorbitError } from "../errors.js";
import { columnTypes, fingerprint, statusIndex, type Cell, type ColumnType } from "../sweep/runCase.js";
import { VERSION } from "../version.js";
import type { SweepRun, SweepSink } from "./sweep.js";

/** Key–value metadata keys. */
export const PARQUET_KEYS = { version: "calorbit.version", definition: "calorbit.definition", shard: "calorbit.shard" } as const;
/** Rows per row group (a commit), unless ROW_GROUP_SECONDS pass first (slow cases). */
const ROW_GROUP_ROWS = 16_384;
const ROW_GROUP_SECONDS = 60;
const MAGIC = 0x31524150; // "PAR1", little-endian
/** Brotli at a low quality: about gzip's ratio on these columns at a fraction of its time; pandas (pyarrow) reads it. */
const CODEC = "BROTLI" as const;
const compressors = { BROTLI: (input: Uint8Array) => new Uint8Array(brotliCompressSync(input, { params: { [zlibConstants.BROTLI_PARAM_QUALITY]: 4 } })) };
/** Decompressors for hyparquet (it reads Snappy by itself). */
export const parquetDecompressors = {
  BROTLI: (input: Uint8Array, outputLength: number) => {
    const out = new Uint8Array(brotliDecompressSync(input));
    if (out.length !== outputLength) throw new Error(`brotli: expected ${outputLength} bytes, got ${out.length}`);
    return out;
  },
};

/** hyparquet-writer's buffered writer, flushed into an open file from a given byte offset. */
function fileWriter(fd: number, startOffset: number): ByteWriter & { flush: () => void } {
  const writer = new ByteWriter(1 << 20) as ByteWriter & { flush: () => void };
  writer.offset = startOffset;
  let position = startOffset;
  const flush = (): void => {
    if (writer.index === 0) return;
    writeSync(fd, new Uint8Array(writer.buffer, 0, writer.index), 0, writer.index, position);
    position += writer.index;
    writer.index = 0;
  };
  const grow = writer.ensure.bind(writer);
  writer.ensure = (size: number) => {
    if (writer.index > 1 << 20) flush();
    grow(size);
  };
  writer.flush = flush;
  writer.finish = flush;
  return writer;
}

function refuse(message: string): CalorbitError {
  return new CalorbitError("USAGE", message, [{ path: "--out", given: message, allowed: "the same command that wrote the file, or a new file name" }]);
}

function readAt(fd: number, position: number, length: number): Uint8Array {
  const buffer = new Uint8Array(length);
  let done = 0;
  while (done < length) {
    const n = readSync(fd, buffer, done, length - done, position + done);
    if (n <= 0) break;
    done += n;
  }
  return buffer.subarray(0, done);
}

/** The footer ending at `end` (just past a "PAR1"), or null when none parses there. */
function footerEndingAt(fd: number, end: number): FileMetaData | null {
  if (end < 12) return null;
  const tail = readAt(fd, end - 8, 8);
  const view = new DataView(tail.buffer, tail.byteOffset, 8);
  if (view.getUint32(4, true) !== MAGIC) return null;
  const length = view.getUint32(0, true);
  if (length === 0 || length > end - 12) return null;
  try {
    return parquetMetadata(readAt(fd, end - 8 - length, length + 8));
  } catch {
    return null;
  }
}

/** The last valid footer at or before the file's end: its end offset and metadata (scanning back over a torn tail). */
function lastFooter(fd: number, size: number): { end: number; metadata: FileMetaData } | null {
  const direct = footerEndingAt(fd, size);
  if (direct) return { end: size, metadata: direct };
  const block = 1 << 20;
  for (let hi = size; hi > 4; hi -= block - 4) {
    const lo = Math.max(0, hi - block);
    const bytes = readAt(fd, lo, hi - lo);
    for (let i = bytes.length - 4; i >= 0; i--) {
      if (bytes[i] === 0x50 && bytes[i + 1] === 0x41 && bytes[i + 2] === 0x52 && bytes[i + 3] === 0x31) {
        const end = lo + i + 4;
        if (end >= size) continue;
        const metadata = footerEndingAt(fd, end);
        if (metadata) return { end, metadata };
      }
    }
    if (lo === 0) break;
  }
  return null;
}

function kv(metadata: FileMetaData, key: string): string | undefined {
  return metadata.key_value_metadata?.find((e) => e.key === key)?.value;
}

/** Column buffers for the rows of the next row group. */
class RowGroupBuffer {
  readonly values: Cell[][];
  rows = 0;
  constructor(readonly types: ColumnType[]) {
    this.values = types.map(() => []);
  }
  add(row: readonly Cell[]): void {
    for (let c = 0; c < this.values.length; c++) this.values[c]!.push(row[c] ?? null);
    this.rows++;
  }
  take(): { name: string; data: unknown[]; type: ColumnType["type"]; nullable: boolean; encoding?: "BYTE_STREAM_SPLIT" }[] {
    const data = this.types.map((t, c) => {
      const v = this.values[c]!;
      // Doubles split into byte streams compress far better (exponents and leading bytes repeat).
      const encoding = t.type === "DOUBLE" ? { encoding: "BYTE_STREAM_SPLIT" as const } : {};
      return { name: t.name, type: t.type, nullable: t.nullable, data: t.type === "INT64" ? v.map((x) => BigInt(x as number)) : v.slice(), ...encoding };
    });
    for (const v of this.values) v.length = 0;
    this.rows = 0;
    return data;
  }
}

/** Opens (or resumes) a Parquet sweep file. */
export async function openParquetOutput(run: SweepRun): Promise<SweepSink> {
  const def = run.definition;
  const path = run.out!;
  const types = columnTypes(def);
  const definition = fingerprint(def);
  const shard = `${run.shard.index}/${run.shard.count}`;
  const kvMetadata = [
    { key: PARQUET_KEYS.version, value: VERSION },
    { key: PARQUET_KEYS.definition, value: definition },
    { key: PARQUET_KEYS.shard, value: shard },
  ];
  const schema = schemaFromColumnData({ columnData: types.map((t) => ({ name: t.name, type: t.type, nullable: t.nullable, data: [] })) });
  const options = { schema, codec: CODEC, compressors, statistics: false, kvMetadata, createdBy: `calorbit ${VERSION}` };

  let fd: number;
  let parquet: ParquetWriter;
  let done = 0;
  let failedBefore = 0;
  let firstFailureBefore: string | null = null;
  const existing = existsSync(path) ? openSync(path, "r+") : null;
  const found = existing === null ? null : lastFooter(existing, fstatSync(existing).size);
  if (existing !== null && found === null && fstatSync(existing).size > 0) {
    closeSync(existing);
    throw refuse(`${path}: refusing to resume: it is not a Parquet file written by calorbit sweep`);
  }
  if (existing !== null && found !== null) {
    fd = existing;
    const { end, metadata } = found;
    if (kv(metadata, PARQUET_KEYS.definition) !== definition || kv(metadata, PARQUET_KEYS.shard) !== shard) {
      closeSync(fd);
      throw refuse(`${path}: refusing to resume: it was written by a different sweep definition or shard`);
    }
    ftruncateSync(fd, end);
    done = Number(metadata.num_rows);
    if (done > 0) {
      const status = statusIndex(def);
      // Only the status column is read (the file is cut to its last footer above).
      const file = await asyncBufferFromFile(path);
      const rows = (await parquetReadObjects({ file, metadata, columns: [types[status]!.name], compressors: parquetDecompressors })) as Record<string, unknown>[];
      for (const r of rows) {
        const s = r.status;
        if (s !== "ok") {
          failedBefore++;
          firstFailureBefore ??= String(s);
        }
      }
    }
    // The writer's header goes to a scratch buffer: the file already has it.
    parquet = new ParquetWriter({ writer: new ByteWriter(), ...options });
    parquet.writer = fileWriter(fd, end);
    parquet.row_groups = metadata.row_groups;
    parquet.num_rows = metadata.num_rows;
  } else {
    if (existing !== null) closeSync(existing);
    fd = openSync(path, "w+");
    parquet = new ParquetWriter({ writer: fileWriter(fd, 0), ...options });
    parquet.finish(); // a valid, empty file from the start
  }

  const buffer = new RowGroupBuffer(types);
  let lastCommit = performance.now();
  const commit = (): void => {
    if (buffer.rows > 0) {
      const rows = buffer.rows;
      parquet.write({ columnData: buffer.take() as never, rowGroupSize: rows });
      parquet.pendingIndexes = [];
      parquet.finish();
    }
    lastCommit = performance.now();
  };
  return {
    done,
    failedBefore,
    firstFailureBefore,
    write: (result) => {
      for (const row of result.rows!) buffer.add(row);
      if (buffer.rows >= (run.rowGroupRows ?? ROW_GROUP_ROWS) || performance.now() - lastCommit > ROW_GROUP_SECONDS * 1000) commit();
    },
    close: () => {
      commit();
      closeSync(fd);
    },
  };
}

/** Whether a file starts with Parquet's magic bytes. */
export function isParquetFile(path: string): boolean {
  try {
    const fd = openSync(path, "r");
    try {
      const head = readAt(fd, 0, 4);
      return head.length === 4 && new DataView(head.buffer, head.byteOffset, 4).getUint32(0, true) === MAGIC;
    } finally {
      closeSync(fd);
    }
  } catch {
    return false;
  }
}

/** A shard file read one row group at a time, in case-id order. */
interface ShardCursor {
  file: string;
  current: Record<string, unknown> | null;
  next(): Promise<void>;
}

async function openCursor(file: string, metadata: FileMetaData, buffer: AsyncBuffer): Promise<ShardCursor> {
  let group = 0;
  let start = 0;
  let rows: Record<string, unknown>[] = [];
  let at = 0;
  const cursor: ShardCursor = {
    file,
    current: null,
    next: async () => {
      while (at >= rows.length) {
        if (group >= metadata.row_groups.length) {
          cursor.current = null;
          return;
        }
        const count = Number(metadata.row_groups[group]!.num_rows);
        rows = (await parquetReadObjects({ file: buffer, metadata, rowStart: start, rowEnd: start + count, compressors: parquetDecompressors })) as Record<string, unknown>[];
        start += count;
        group++;
        at = 0;
      }
      cursor.current = rows[at++]!;
    },
  };
  await cursor.next();
  return cursor;
}

/**
 * Joins Parquet shard files of one sweep into one Parquet file in case-id order, checking that every
 * case is present exactly once (as the text merge does); memory holds one row group per shard.
 */
export async function mergeParquetShards(files: string[], out: string, totalFor: (definitionJson: string) => number): Promise<{ cases: number }> {
  const opened = await Promise.all(
    files.map(async (file) => {
      const buffer = await asyncBufferFromFile(file);
      let metadata: FileMetaData;
      try {
        metadata = await parquetMetadataAsync(buffer);
      } catch {
        throw new CalorbitError("USAGE", `${file}: not a complete Parquet file`, [{ path: "files", given: file, allowed: "complete shard files (rerun an incomplete shard: it resumes)" }]);
      }
      const definition = kv(metadata, PARQUET_KEYS.definition);
      if (definition === undefined) throw new CalorbitError("USAGE", `${file}: not a calorbit sweep file`, [{ path: "files", given: file, allowed: "files written by calorbit sweep" }]);
      return { file, buffer, metadata, definition };
    }),
  );
  const first = opened[0]!;
  for (const o of opened) {
    if (o.definition !== first.definition) throw new CalorbitError("USAGE", `${o.file}: not a shard of the same sweep as ${first.file}`, [{ path: "files", given: o.file, allowed: "shards written by one sweep definition" }]);
  }
  const total = totalFor(first.definition);
  const cursors = await Promise.all(opened.map((o) => openCursor(o.file, o.metadata, o.buffer)));
  const schema = first.metadata.schema;
  const leaves = schema.slice(1);
  const shardCount = /^\d+\/(\d+)$/.exec(kv(first.metadata, PARQUET_KEYS.shard) ?? "")?.[1] ?? "?";
  const kvMetadata = [
    { key: PARQUET_KEYS.version, value: kv(first.metadata, PARQUET_KEYS.version) ?? VERSION },
    { key: PARQUET_KEYS.definition, value: first.definition },
    { key: PARQUET_KEYS.shard, value: `merged from ${files.length} of ${shardCount} shards` },
  ];
  const temporary = `${out}.${process.pid}.partial`;
  const fd = openSync(temporary, "w+");
  const writer = new ParquetWriter({ writer: fileWriter(fd, 0), schema, codec: CODEC, compressors, statistics: false, kvMetadata, createdBy: `calorbit ${VERSION}` });
  const columns = leaves.map((): unknown[] => []);
  const flush = (): void => {
    if (columns[0]!.length === 0) return;
    const columnData = leaves.map((e, c) => ({ name: e.name, data: columns[c]!.slice(), ...(e.type === "DOUBLE" ? { encoding: "BYTE_STREAM_SPLIT" as const } : {}) }));
    writer.write({ columnData: columnData as never, rowGroupSize: columns[0]!.length });
    writer.pendingIndexes = [];
    for (const c of columns) c.length = 0;
  };
  const missing: number[] = [];
  const duplicates: number[] = [];
  let expected = 0;
  try {
    for (;;) {
      let best: ShardCursor | null = null;
      for (const c of cursors) if (c.current && (best === null || Number(c.current.case_id) < Number(best.current!.case_id))) best = c;
      if (best === null) break;
      const row = best.current!;
      await best.next();
      const id = Number(row.case_id);
      if (id < expected) {
        if (duplicates.length < 13) duplicates.push(id);
        continue;
      }
      while (expected < id) {
        if (missing.length < 13) missing.push(expected);
        expected++;
      }
      leaves.forEach((e, c) => columns[c]!.push(row[e.name] ?? null));
      if (columns[0]!.length >= ROW_GROUP_ROWS) flush();
      expected++;
    }
    while (expected < total) {
      if (missing.length < 13) missing.push(expected);
      expected++;
    }
    flush();
    writer.finish();
  } finally {
    closeSync(fd);
  }
  if (missing.length > 0 || duplicates.length > 0) {
    rmSync(temporary, { force: true });
    const list = (a: number[]) => (a.length > 12 ? `${a.slice(0, 12).join(", ")} …` : a.join(", "));
    const parts = [missing.length ? `cases missing (case ids ${list(missing)})` : "", duplicates.length ? `cases present twice (case ids ${list(duplicates)})` : ""].filter(Boolean);
    throw new CalorbitError("USAGE", `sweep merge: ${parts.join("; ")}; nothing written`, [
      { path: "files", given: `sweep merge: ${parts.join("; ")}; nothing written`, allowed: "every shard of the sweep, each complete (rerun an incomplete shard: it resumes)" },
    ]);
  }
  renameSync(temporary, out);
  return { cases: total };
}

/** A Parquet sweep file's rows, for the viewer: the column names in order and the rows as records. */
export async function readParquetSweep(path: string): Promise<{ header: string[]; records: Record<string, unknown>[] }> {
  const file = await asyncBufferFromFile(path);
  const metadata = await parquetMetadataAsync(file);
  if (kv(metadata, PARQUET_KEYS.definition) === undefined) throw new CalorbitError("USAGE", `${path}: a Parquet file not written by calorbit sweep`, []);
  const records = (await parquetReadObjects({ file, metadata, compressors: parquetDecompressors })) as Record<string, unknown>[];
  return { header: metadata.schema.slice(1).map((e) => e.name), records };
}
