#!/usr/bin/env node
// The `calorbit` executable: everything lives in program.ts, so tests can drive it in-process.
import { main } from "./program.js";

process.exitCode = main(process.argv);
