#!/usr/bin/env node
// The `calorbit` executable: everything lives in program.ts, so tests can drive it in-process.
import { spawn } from "node:child_process";
import { main } from "./program.js";

// Sweeps run worker threads flat out; V8's shared pool of garbage-collection helper threads then
// competes with them for the cores (measured: two workers gave 1.3× one, 2× with the flag).
// So a sweep re-runs itself with single-threaded GC when it was not started that way.
const GC_FLAG = "--single-threaded-gc";
if (process.argv[2] === "sweep" && !process.execArgv.includes(GC_FLAG)) {
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
