import { request } from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startViewServer, type ViewServer } from "../src/cli/viewServer.js";

let viewer: ViewServer;
beforeAll(async () => {
  viewer = await startViewServer('{"ok":true}', 0);
});
afterAll(() => viewer.close());

function get(path: string, method = "GET", host?: string): Promise<{ status: number; body: string; headers: Record<string, unknown> }> {
  const { port } = new URL(viewer.url);
  return new Promise((resolve, reject) => {
    // The raw path is sent as written: Node's client does not normalise "/../".
    const req = request({ host: "127.0.0.1", port, path, method, ...(host !== undefined ? { headers: { host } } : {}) }, (res) => {
      let body = "";
      res.on("data", (c) => (body += c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, body, headers: res.headers }));
    });
    req.on("error", reject);
    req.end();
  });
}

describe("viewer server", () => {
  it("binds to the loopback address only", () => {
    const address = viewer.server.address();
    expect(typeof address === "object" && address?.address).toBe("127.0.0.1");
    expect(viewer.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/$/);
  });
  it("serves the result document", async () => {
    const r = await get("/result.json");
    expect({ status: r.status, body: r.body }).toEqual({ status: 200, body: '{"ok":true}' });
  });
  it("refuses path traversal, plain or encoded", async () => {
    expect((await get("/../package.json")).status).toBe(400);
    expect((await get("/%2e%2e/%2e%2e/package.json")).status).toBe(400);
    expect((await get("/..%2fpackage.json")).status).toBe(400);
  });
  it("serves nothing outside its list", async () => {
    expect((await get("/package.json")).status).toBe(404);
    expect((await get("/src/cli/viewServer.ts")).status).toBe(404);
  });
  it("answers only requests addressed to itself (DNS rebinding: 421 Misdirected Request, RFC 9110 §15.5.20) and grants no CORS", async () => {
    const { port } = new URL(viewer.url);
    for (const host of [`127.0.0.1:${port}`, `localhost:${port}`, `[::1]:${port}`, `LOCALHOST:${port}`]) {
      expect({ host, status: (await get("/result.json", "GET", host)).status }).toEqual({ host, status: 200 });
    }
    for (const host of [`evil.example:${port}`, "127.0.0.1", `127.0.0.1:${Number(port) + 1}`, `localhost.evil.example:${port}`]) {
      const r = await get("/result.json", "GET", host);
      expect({ host, status: r.status }).toEqual({ host, status: 421 });
      expect(r.body).not.toContain("ok");
    }
    const plain = await get("/result.json");
    expect(Object.keys(plain.headers).filter((h) => h.startsWith("access-control-"))).toEqual([]);
  });
  it("answers only GET and HEAD", async () => {
    expect((await get("/", "POST")).status).toBe(405);
    expect((await get("/result.json", "DELETE")).status).toBe(405);
    expect((await get("/result.json", "HEAD")).status).toBe(200);
  });
});
