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
export function startView(file?: string): Promise<{ server: ChildProcess; url: string }> {
  const server = spawn(process.execPath, [CLI, "view", ...(file !== undefined ? [file] : []), "--port", "0"], { stdio: ["ignore", "pipe", "pipe"] });
  return new Promise((resolve, reject) => {
    let out = "";
    server.stdout!.on("data", (chunk: Buffer) => {
      out += chunk.toString();
      const m = /(http:\/\/127\.0\.0\.1:\d+\/)/.exec(out);
      if (m) resolve({ server, url: m[1]! });
    });
    server.on("exit", (code) => reject(new Error(`calorbit view exited (${code})`)));
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
