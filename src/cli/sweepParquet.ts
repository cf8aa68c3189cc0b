/**
 * Sweep rows as Apache Parquet (written with hyparquet-writer, read back with hyparquet), resumable by
 * row groups. After each row group the file's footer is written anew, so the file on disk is a valid
 * Parquet file after every commit; the previous footer stays behind as dead bytes between row groups
 * (readers find everything through the last footer's offsets). A crash mid-commit leaves a torn tail:
 * resuming looks back from the end for the last footer that parses and carries this sweep's definition,
 * cuts the file there and carries on. The definition, version and shard are in the key–value metadata.
 */
import { closeSync, existsSync, fstatSync, ftruncateSync, openSync, readSync, writeSync } from "node:fs";
import { brotliCompressSync, brotliDecompressSync, constants as zlibConstants } from "node:zlib";
import { parquetMetadata, parquetReadObjects, type FileMetaData } from "hyparquet";
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
      const bytes = readAt(fd, 0, end);
      const file = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
      const rows = (await parquetReadObjects({ file, columns: [types[status]!.name], compressors: parquetDecompressors })) as Record<string, unknown>[];
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
      if (buffer.rows >= ROW_GROUP_ROWS || performance.now() - lastCommit > ROW_GROUP_SECONDS * 1000) commit();
    },
    close: () => {
      commit();
      closeSync(fd);
    },
  };
}
