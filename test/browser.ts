/**
 * What the browser tests share: Debian's chromium driven by playwright-core (never a browser that a
 * test tool downloads), a loud skip outside CI when it is missing (a failure in CI), and the
 * `calorbit view` server started on a free port.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync } from "node:fs";
import { join } from "node:path";
import { chromium, type Browser } from "playwright-core";

export const CHROMIUM = process.env.CALORBIT_CHROMIUM ?? "/usr/bin/chromium";
export const CLI = join(import.meta.dirname, "..", "dist", "src", "cli", "main.js");

/** Whether chromium is here; says so loudly when not, and fails under CI=true. */
export function browserAvailable(what: string): boolean {
  if (existsSync(CHROMIUM)) return true;
  const message = `\n*** ${CHROMIUM} not found: the browser test of ${what} is SKIPPED. Install Debian's chromium (apt-get install chromium). ***\n`;
  if (process.env.CI === "true") throw new Error(message);
  console.warn(message);
  return false;
}

/** Starts `calorbit view [file] --port 0` and resolves with the server and the address it prints. */
export function startView(file?: string): Promise<{ server: ChildProcess; url: string; stdout: () => string }> {
  return startServing(["view", ...(file !== undefined ? [file] : []), "--port", "0"]);
}

/**
 * Starts a calorbit command that ends by serving the viewer (`view`, `fit --view`) and resolves with
 * the process, the address it prints (on stdout, or on stderr when stdout holds a JSON document) and
 * what it has written to stdout so far.
 */
export function startServing(args: string[]): Promise<{ server: ChildProcess; url: string; stdout: () => string }> {
  const server = spawn(process.execPath, [CLI, ...args], { stdio: ["ignore", "pipe", "pipe"] });
  return new Promise((resolve, reject) => {
    let out = "";
    let said = "";
    const look = (chunk: Buffer, toStdout: boolean) => {
      if (toStdout) out += chunk.toString();
      said += chunk.toString();
      const m = /(http:\/\/127\.0\.0\.1:\d+\/)/.exec(said);
      if (m) resolve({ server, url: m[1]!, stdout: () => out });
    };
    server.stdout!.on("data", (chunk: Buffer) => look(chunk, true));
    server.stderr!.on("data", (chunk: Buffer) => look(chunk, false));
    server.on("exit", (code) => reject(new Error(`calorbit ${args[0]} exited (${code}): ${said.slice(-300)}`)));
  });
}

/** Headless chromium with the flags this closed network needs. */
export function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run", "--disable-quic"],
  });
}
