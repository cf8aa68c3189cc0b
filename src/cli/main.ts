#!/usr/bin/env node
// The `calorbit` executable: everything lives in program.ts, so tests can drive it in-process.
import { spawn } from "node:child_process";
import { isBrokenPipe, main } from "./program.js";

// `calorbit … | head` closes the pipe early; the next write to stdout fails with EPIPE. That is the
// reader's choice, not an error: stop quietly with status 0 instead of printing a stack trace.
for (const stream of [process.stdout, process.stderr]) {
  stream.on("error", (error) => {
    if (isBrokenPipe(error)) process.exit(0);
    throw error;
  });
}

// Sweeps run worker threads flat out; V8's shared pool of garbage-collection helper threads then
// competes with them for the cores (measured: two workers gave 1.3× one, 2× with the flag).
// So a sweep re-runs itself with single-threaded GC when it was not started that way.
const GC_FLAG = "--single-threaded-gc";
const wantsHelp = process.argv.includes("--help") || process.argv.includes("-h");
if (process.argv[2] === "sweep" && !wantsHelp && !process.execArgv.includes(GC_FLAG)) {
  const child = spawn(process.execPath, [...process.execArgv, GC_FLAG, ...process.argv.slice(1)], { stdio: "inherit" });
  for (const signal of ["SIGINT", "SIGTERM"] as const) process.on(signal, () => child.kill(signal));
  child.on("exit", (code, signal) => {
    process.exitCode = code ?? (signal ? 1 : 0);
  });
} else {
  void main(process.argv).then((status) => {
    process.exitCode = status;
  });
}
