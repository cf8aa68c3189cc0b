/**
 * The viewer's local server: binds to 127.0.0.1 only, serves the built viewer (dist/web) and one
 * result document, answers GET and HEAD only, and refuses any path outside its short list. It answers
 * only requests addressed to itself (Host 127.0.0.1:PORT, localhost:PORT or [::1]:PORT; 421 otherwise)
 * and grants no cross-origin access: a web page whose own name is pointed at 127.0.0.1 (DNS
 * rebinding) sends its own name as Host, so it cannot read the result.
 */
import { readFileSync } from "node:fs";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { fileURLToPath } from "node:url";

const WEB_DIR = fileURLToPath(new URL("../../web/", import.meta.url));
const FILES: Record<string, { file: string; type: string }> = {
  "/": { file: "index.html", type: "text/html; charset=utf-8" },
  "/index.html": { file: "index.html", type: "text/html; charset=utf-8" },
  "/viewer.js": { file: "viewer.js", type: "text/javascript; charset=utf-8" },
  "/style.css": { file: "style.css", type: "text/css; charset=utf-8" },
  "/uPlot.min.css": { file: "uPlot.min.css", type: "text/css; charset=utf-8" },
};

export interface ViewServer {
  server: Server;
  url: string;
  close(): Promise<void>;
}

/** The Host header values that name this server on `port`. */
function loopbackHosts(port: number): Set<string> {
  return new Set([`127.0.0.1:${port}`, `localhost:${port}`, `[::1]:${port}`]);
}

/** Starts the server on 127.0.0.1:port (0 = a free port) serving `resultJson` at /result.json. */
export function startViewServer(resultJson: string, port: number): Promise<ViewServer> {
  const server = createServer((req, res) => {
    const security = {
      "X-Content-Type-Options": "nosniff",
      "Content-Security-Policy": "default-src 'self'; img-src 'self' data: blob:; style-src 'self' 'unsafe-inline'",
      "Cache-Control": "no-store",
    };
    const port = (server.address() as AddressInfo | null)?.port;
    if (port === undefined || !loopbackHosts(port).has((req.headers.host ?? "").toLowerCase())) {
      res.writeHead(421, { ...security, "Content-Type": "text/plain" }).end("misdirected request: this server answers only 127.0.0.1, localhost or [::1] with its port\n");
      return;
    }
    if (req.method !== "GET" && req.method !== "HEAD") {
      res.writeHead(405, { ...security, Allow: "GET, HEAD", "Content-Type": "text/plain" }).end("method not allowed\n");
      return;
    }
    const raw = req.url ?? "/";
    const path = raw.split("?")[0]!;
    let decoded: string;
    try {
      decoded = decodeURIComponent(path);
    } catch {
      decoded = "\0";
    }
    if (decoded.includes("..") || decoded.includes("\\") || decoded.includes("\0")) {
      res.writeHead(400, { ...security, "Content-Type": "text/plain" }).end("bad path\n");
      return;
    }
    if (path === "/result.json") {
      res.writeHead(200, { ...security, "Content-Type": "application/json" }).end(req.method === "HEAD" ? undefined : resultJson);
      return;
    }
    const entry = FILES[path];
    if (!entry) {
      res.writeHead(404, { ...security, "Content-Type": "text/plain" }).end("not found\n");
      return;
    }
    try {
      const body = readFileSync(WEB_DIR + entry.file);
      res.writeHead(200, { ...security, "Content-Type": entry.type }).end(req.method === "HEAD" ? undefined : body);
    } catch {
      res.writeHead(500, { ...security, "Content-Type": "text/plain" }).end("viewer not built: run npm run build\n");
    }
  });
  return new Promise((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, "127.0.0.1", () => {
      const address = server.address() as AddressInfo;
      resolve({
        server,
        url: `http://127.0.0.1:${address.port}/`,
        close: () => new Promise((done) => server.close(() => done())),
      });
    });
  });
}

/**
 * Serves `resultJson` until SIGINT or SIGTERM, saying where through `say` (a command's stdout, or
 * stderr when stdout holds a document).
 */
export async function serveUntilStopped(resultJson: string, port: number, say: (text: string) => void): Promise<void> {
  const viewer = await startViewServer(resultJson, port);
  say(`calorbit viewer at ${viewer.url}  (Ctrl-C stops it)\n`);
  await new Promise<void>((resolve) => {
    const stop = () => {
      say("stopping the viewer\n");
      void viewer.close().then(resolve);
      // Keep-alive connections from a browser would hold close() open; do not wait for them.
      viewer.server.closeAllConnections();
    };
    process.once("SIGINT", stop);
    process.once("SIGTERM", stop);
  });
}
