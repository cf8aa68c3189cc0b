/**
 * `calorbit sweep`: runs a sweep across worker threads and streams its rows to a file in case-id
 * order; resumes an interrupted file; `merge` joins shard files. Memory stays flat: the rows of
 * at most 16 chunks per worker are ever held, and files are read in fixed-size blocks.
 */
import { closeSync, existsSync, fstatSync, ftruncateSync, openSync, readSync, renameSync, rmSync, writeSync } from "node:fs";
import { cpus } from "node:os";
import { resolve as resolvePath } from "node:path";
import { StringDecoder } from "node:string_decoder";
import { Worker } from "node:worker_threads";
import cliProgress from "cli-progress";
import { CalorbitError } from "../errors.js";
import { caseCount, shardIds, shardSize, type Shard } from "../sweep/design.js";
import { caseMaker } from "../sweep/design.js";
import { caseRunner, headerLines, JSONL_MARKER, lineCaseId, lineOk, readHeader, runChunk, type ChunkResult, type SweepDefinition } from "../sweep/runCase.js";

export type { ChunkResult } from "../sweep/runCase.js";

/**
 * Cases per chunk sent to a worker: 32 for a long sweep (fewer messages), fewer for a short one, so
 * that its cases spread over the workers and rows land as they finish (slow column cases above all).
 */
const MAX_CHUNK = 32;
/**
 * A sweep with no more cases than this left runs in the main thread: a worker thread loads every
 * module again (about a second on a loaded machine), which is more than such a sweep's cases take.
 */
const IN_THREAD_CASES = 48;
/**
 * A case needs well under 1 MiB of live heap (a worker holds about 9 MiB after a collection), but
 * V8 lets an old generation grow with the run's length before it collects; a cap keeps a long
 * sweep's peak memory the same as a short one's.
 */
const WORKER_HEAP_LIMITS = { maxOldGenerationSizeMb: 48, maxYoungGenerationSizeMb: 12 };
const READ_BLOCK = 1 << 20;
/**
 * Chunks a worker may run ahead of the file's write position. Stiff cases sit next to each other
 * in a grid, so one chunk can take ten times as long as its neighbours; with only a few chunks of
 * slack the other workers stalled behind it (measured: 100,000 cases on 2 workers took 13.4–16.5 s
 * with 4 chunks in all, 12.4–13.8 s with 16 per worker). At ~8 KiB of text per chunk the held rows
 * stay well under a megabyte.
 */
const WINDOW_CHUNKS_PER_WORKER = 16;
/**
 * Cases a worker runs first, spread evenly over the sweep, whose rows it throws away. V8 compiles
 * a hot function for the case kinds it has seen; a sweep in id order shows a worker one corner of
 * the grid at a time, and each new corner (a stiff slab, a high eccentricity) throws compiled code
 * away to be compiled again (measured: 162 optimising compiles for 10,000 lumped cases, the largest
 * five times). A sample across the sweep first cut a worker's CPU by about a tenth, steady cases
 * included. At most this many, and at most 1% of a worker's share of the cases.
 */
const WARM_UP_CASES = 48;

export interface SweepRun {
  definition: SweepDefinition;
  shard: Shard;
  out?: string;
  workers: number;
  quiet: boolean;
  /** Parquet: rows per row group (each one a commit a resume keeps); the default suits long sweeps. */
  rowGroupRows?: number;
}

export interface SweepResult {
  /** Cases run and written now. */
  written: number;
  /** Cases already in the file (a resumed run). */
  skipped: number;
  /** Failed cases among all of the shard's cases in the file (written now or before). */
  failed: number;
  /** The first failure's status, for the closing message. */
  firstFailure: string | null;
}

/** Where a sweep's rows go, in case-id order. */
export interface SweepSink {
  /** Rows of this shard already there (resume). */
  done: number;
  /** Failed cases among them. */
  failedBefore: number;
  firstFailureBefore: string | null;
  write(result: ChunkResult): void;
  close(): void;
}

/**
 * Reads a file's lines in fixed-size blocks, on demand (sync; memory bounded by the block). A
 * StringDecoder keeps characters split across blocks whole (status lines carry "≤"), and
 * `endOffset` is the byte offset just past the last line returned, for cutting off a torn row.
 */
class LineReader {
  private readonly buffer = Buffer.alloc(READ_BLOCK);
  private readonly decoder = new StringDecoder("utf8");
  private pending = "";
  private cursor = 0;
  private offset = 0;
  private eof = false;
  endOffset = 0;

  /** Reads from an open descriptor; closes it at the end only if `owned`. */
  constructor(
    private readonly fd: number,
    private readonly owned: boolean,
  ) {}

  static open(file: string): LineReader {
    return new LineReader(openSync(file, "r"), true);
  }

  /** The next complete line, or null at the end (a torn last line is not returned). */
  next(): string | null {
    for (;;) {
      const nl = this.pending.indexOf("\n", this.cursor);
      if (nl >= 0) {
        const line = this.pending.slice(this.cursor, nl);
        this.cursor = nl + 1;
        this.endOffset += Buffer.byteLength(line, "utf8") + 1;
        return line;
      }
      if (this.eof) return null;
      const read = readSync(this.fd, this.buffer, 0, READ_BLOCK, this.offset);
      const rest = this.pending.slice(this.cursor);
      this.cursor = 0;
      if (read <= 0) {
        this.eof = true;
        this.pending = rest + this.decoder.end();
        if (this.owned) closeSync(this.fd);
        continue;
      }
      this.offset += read;
      this.pending = rest + this.decoder.write(this.buffer.subarray(0, read));
    }
  }
}

function refuse(message: string, path: string, allowed: string): CalorbitError {
  return new CalorbitError("USAGE", message, [{ path, given: message, allowed }]);
}

/**
 * Opens a text output (CSV, JSON Lines) for appending: a new file gets the header; an existing one
 * must carry the same definition and shard, and its rows must be this shard's first cases in order. A
 * torn last line (a crash mid-write) is cut off. Returns the sink, knowing the cases already done.
 */
function openTextOutput(run: SweepRun): SweepSink {
  const header = headerLines(run.definition, run.shard);
  const sinkOn = (fd: number, done: number, failedBefore: number, firstFailureBefore: string | null): SweepSink => ({
    done,
    failedBefore,
    firstFailureBefore,
    write: (r) => writeSync(fd, r.text!),
    close: () => {
      if (fd !== 1) closeSync(fd);
    },
  });
  if (run.out === undefined) {
    writeSync(1, header.join("\n") + "\n");
    return sinkOn(1, 0, 0, null);
  }
  const path = run.out;
  if (!existsSync(path)) {
    const fd = openSync(path, "a");
    writeSync(fd, header.join("\n") + "\n");
    return sinkOn(fd, 0, 0, null);
  }
  const fd = openSync(path, "r+");
  const total = caseCount(run.definition.design);
  const expected = shardIds(total, run.shard);
  const headerRead: string[] = [];
  let done = 0;
  let failed = 0;
  let firstFailure: string | null = null;
  let problem: string | null = null;
  const reader = new LineReader(fd, false);
  for (let line = reader.next(); line !== null && problem === null; line = reader.next()) {
    if (headerRead.length < header.length) {
      headerRead.push(line);
      if (line !== header[headerRead.length - 1]) {
        const calorbit = headerRead[0]!.startsWith("# calorbit ") || headerRead[0]!.startsWith(`{"${JSONL_MARKER}":`);
        problem = calorbit ? "it was written by a different sweep definition or shard" : "its header is not a calorbit sweep header";
      }
      continue;
    }
    const next = expected.next();
    if (next.done || lineCaseId(line, run.definition.format) !== next.value) {
      problem = `its rows are not this sweep's cases in order (at row ${done + 1})`;
    } else {
      done++;
      if (!lineOk(line, run.definition)) {
        failed++;
        firstFailure ??= line;
      }
    }
  }
  const completeEnd = reader.endOffset;
  const size = fstatSync(fd).size;
  if (problem) {
    closeSync(fd);
    throw refuse(`${path}: refusing to resume: ${problem}`, "--out", "the same command that wrote the file, or a new file name");
  }
  if (headerRead.length < header.length) {
    // Torn inside the header: start the file again.
    ftruncateSync(fd, 0);
    writeSync(fd, header.join("\n") + "\n", 0);
    return sinkOn(fd, 0, 0, null);
  }
  if (completeEnd < size) ftruncateSync(fd, completeEnd); // a torn last row
  closeSync(fd);
  return sinkOn(openSync(path, "a"), done, failed, firstFailure === null ? null : statusOfLine(firstFailure));
}

/** The status text of a row line, for messages. */
function statusOfLine(line: string): string {
  const m = /"?(error: [^"]*)"?/.exec(line);
  return m ? m[1]! : line;
}

export async function runSweep(run: SweepRun): Promise<SweepResult> {
  const total = caseCount(run.definition.design);
  const size = shardSize(total, run.shard);
  // Parquet's writer and reader load only for a Parquet sweep.
  const sink = run.definition.format === "parquet" ? await (await import("./sweepParquet.js")).openParquetOutput(run) : openTextOutput(run);
  const ids = shardIds(total, run.shard);
  for (let i = 0; i < sink.done; i++) ids.next();
  const remaining = size - sink.done;
  let failed = sink.failedBefore;
  let firstFailure = sink.firstFailureBefore;

  const showProgress = !run.quiet && process.stderr.isTTY === true;
  const bar = showProgress
    ? new cliProgress.SingleBar(
        { format: "sweep |{bar}| {value}/{total} cases | {rate} cases/s | eta {eta_formatted}", stream: process.stderr, etaBuffer: 200 },
        cliProgress.Presets.shades_classic,
      )
    : null;
  bar?.start(size, sink.done, { rate: "0" });
  const startedAt = performance.now();

  const chunkSize = Math.max(1, Math.min(MAX_CHUNK, Math.ceil(remaining / (8 * run.workers))));
  if (remaining <= IN_THREAD_CASES) {
    const makeCase = caseMaker(run.definition.design);
    const runCase = caseRunner(run.definition);
    let written = 0;
    try {
      for (let chunk = 0; ; chunk++) {
        const chunkIds: number[] = [];
        while (chunkIds.length < chunkSize) {
          const n = ids.next();
          if (n.done) break;
          chunkIds.push(n.value);
        }
        if (chunkIds.length === 0) break;
        const result = runChunk(run.definition, makeCase, chunk, chunkIds, runCase);
        sink.write(result);
        written += result.count;
        failed += result.failed;
        firstFailure ??= result.firstFailure;
        bar?.update(sink.done + written, { rate: (written / ((performance.now() - startedAt) / 1000)).toFixed(0) });
      }
    } finally {
      bar?.stop();
      sink.close();
    }
    return { written, skipped: sink.done, failed, firstFailure };
  }
  const workerCount = Math.max(1, Math.min(run.workers, Math.ceil(remaining / chunkSize) || 1));
  const workers: Worker[] = [];
  let nextChunk = 0;
  let nextToWrite = 0;
  let written = 0;
  const finished = new Map<number, ChunkResult>();
  const takeChunk = (): number[] | null => {
    const chunk: number[] = [];
    for (let i = 0; i < chunkSize; i++) {
      const n = ids.next();
      if (n.done) break;
      chunk.push(n.value);
    }
    return chunk.length > 0 ? chunk : null;
  };

  const finishedRun = new Promise<void>((resolve, reject) => {
    let active = 0;
    const flush = (): void => {
      for (let entry = finished.get(nextToWrite); entry; entry = finished.get(nextToWrite)) {
        sink.write(entry);
        finished.delete(nextToWrite);
        nextToWrite++;
        written += entry.count;
        failed += entry.failed;
        firstFailure ??= entry.firstFailure;
        if (bar) bar.update(sink.done + written, { rate: (written / ((performance.now() - startedAt) / 1000)).toFixed(0) });
      }
    };
    const inFlight = new Map<Worker, number>();
    // Workers waiting for the writer to catch up (a slow chunk holds back the file order).
    const stalled: Worker[] = [];
    const feed = (worker: Worker): void => {
      // Keep a bounded number of chunks ahead of the writer, so memory does not grow with the
      // sweep; a worker that would go past it waits until the writer moves on.
      if (nextChunk - nextToWrite >= WINDOW_CHUNKS_PER_WORKER * workerCount) {
        stalled.push(worker);
        return;
      }
      const chunkIds = takeChunk();
      if (!chunkIds) {
        if (inFlight.get(worker) === 0) {
          inFlight.delete(worker);
          active--;
          void worker.terminate();
          if (active === 0) resolve();
        }
        return;
      }
      inFlight.set(worker, (inFlight.get(worker) ?? 0) + 1);
      worker.postMessage({ chunk: nextChunk++, ids: chunkIds });
    };
    if (remaining === 0) {
      resolve();
      return;
    }
    const warmUpIds = warmUpSample(run.shard, sink.done, remaining, Math.min(WARM_UP_CASES, Math.floor(remaining / (100 * workerCount))));
    for (let w = 0; w < workerCount; w++) {
      const worker = new Worker(new URL("./sweepWorker.js", import.meta.url), { workerData: { definition: run.definition, warmUpIds }, resourceLimits: WORKER_HEAP_LIMITS });
      workers.push(worker);
      active++;
      worker.on("message", (m: ChunkResult) => {
        finished.set(m.chunk, m);
        inFlight.set(worker, inFlight.get(worker)! - 1);
        flush();
        feed(worker);
        while (stalled.length > 0 && nextChunk - nextToWrite < WINDOW_CHUNKS_PER_WORKER * workerCount) feed(stalled.shift()!);
      });
      worker.on("error", (err: Error) => {
        // Stop the others too; every row written so far stays, and rerunning resumes after it.
        for (const w of workers) void w.terminate();
        reject(
          new CalorbitError(
            "SWEEP_WORKER_FAILED",
            `a sweep worker stopped (${err.message.split("\n")[0]}); ${written} cases are in the output, rerun the same command to resume`,
          ),
        );
      });
      // Two chunks in flight per worker: the next one is already queued when a worker finishes, so
      // it never idles while the main thread waits for a core to hand it more work.
      feed(worker);
      feed(worker);
    }
  });
  try {
    await finishedRun;
  } finally {
    bar?.stop();
    sink.close();
  }
  return { written, skipped: sink.done, failed, firstFailure };
}

/** `count` case ids spread evenly over the shard's cases still to run (its positions from `done` on). */
function warmUpSample(shard: Shard, done: number, remaining: number, count: number): number[] {
  const ids: number[] = [];
  for (let j = 0; j < count; j++) {
    const position = done + (count === 1 ? 0 : Math.round((j * (remaining - 1)) / (count - 1)));
    ids.push(shard.index - 1 + position * shard.count);
  }
  return ids;
}

/**
 * Joins shard files of one sweep into one file in case-id order, checking that every case is
 * present exactly once. A streaming k-way merge by case id: each shard is already in id order.
 */
export function mergeShards(files: string[], out: string, totalFor: (definitionJson: string) => number): { cases: number } {
  if (files.length === 0) throw refuse("sweep merge: no shard files given", "files", "one or more shard files");
  for (const file of files) if (!existsSync(file)) throw refuse(`${file}: no such file`, "files", "existing shard files");
  if (files.some((file) => resolvePath(file) === resolvePath(out))) throw refuse(`sweep merge: --out ${out} is one of the shard files`, "--out", "a new file name (an input is never overwritten)");
  const readers = files.map((file) => {
    const reader = LineReader.open(file);
    const head: string[] = [];
    for (let i = 0; i < 4; i++) {
      const line = reader.next();
      if (line === null) break;
      head.push(line);
    }
    const header = readHeader(head);
    if (!header) throw refuse(`${file}: not a calorbit sweep file`, "files", "files written by calorbit sweep (CSV or JSON Lines)");
    const lines = head.slice(header.lineCount);
    const nextLine = (): string | null => (lines.length > 0 ? lines.shift()! : reader.next());
    return { file, header, headLines: head.slice(0, header.lineCount), reader: { next: nextLine }, current: nextLine() };
  });
  const first = readers[0]!;
  for (const r of readers) {
    if (r.header.definition !== first.header.definition) throw refuse(`${r.file}: not a shard of the same sweep as ${first.file}`, "files", "shards written by one sweep definition");
  }
  const total = totalFor(first.header.definition);
  const format = first.header.format;
  const idOf = (line: string) => lineCaseId(line, format);
  const missing: number[] = [];
  const duplicates: number[] = [];
  const note = (list: number[], id: number) => {
    if (list.length < 1000) list.push(id);
    else list.push(-1);
  };
  const temporary = `${out}.${process.pid}.partial`;
  const fd = openSync(temporary, "w");
  const shardCount = /^\d+\/(\d+)$/.exec(first.header.shard)?.[1] ?? "?";
  const mergedShard = `merged from ${files.length} of ${shardCount} shards`;
  const mergedHeader =
    format === "jsonl"
      ? [first.headLines[0]!.replace(/"shard":"[^"]*"\}\}$/, `"shard":${JSON.stringify(mergedShard)}}}`)]
      : [first.headLines[0]!, first.headLines[1]!, `# shard: ${mergedShard}`, ...first.headLines.slice(3)];
  writeSync(fd, mergedHeader.join("\n") + "\n");
  let expected = 0;
  let block: string[] = [];
  for (;;) {
    let best = -1;
    for (let i = 0; i < readers.length; i++) {
      const c = readers[i]!.current;
      if (c !== null && c !== "" && (best < 0 || idOf(c) < idOf(readers[best]!.current!))) best = i;
    }
    if (best < 0) break;
    const line = readers[best]!.current!;
    readers[best]!.current = readers[best]!.reader.next();
    const id = idOf(line);
    if (id < expected) {
      note(duplicates, id);
      continue;
    }
    while (expected < id) note(missing, expected++);
    block.push(line);
    if (block.length >= 1000) {
      writeSync(fd, block.join("\n") + "\n");
      block = [];
    }
    expected++;
  }
  while (expected < total) note(missing, expected++);
  if (block.length > 0) writeSync(fd, block.join("\n") + "\n");
  closeSync(fd);
  if (missing.length > 0 || duplicates.length > 0) {
    rmSync(temporary, { force: true });
    const list = (a: number[]) => {
      const ids = a.filter((x) => x >= 0);
      return a.length > 12 ? `${ids.slice(0, 12).join(", ")} …` : ids.join(", ");
    };
    const parts = [
      missing.length ? `${missing.length >= 1000 ? "1000 or more" : missing.length} missing (case ids ${list(missing)})` : "",
      duplicates.length ? `${duplicates.length >= 1000 ? "1000 or more" : duplicates.length} present twice (case ids ${list(duplicates)})` : "",
    ].filter(Boolean);
    throw refuse(`sweep merge: ${parts.join("; ")}; nothing written`, "files", "every shard of the sweep, each complete (rerun an incomplete shard: it resumes)");
  }
  renameSync(temporary, out);
  return { cases: total };
}

export function defaultWorkers(): number {
  return Math.max(1, cpus().length);
}
