// Bundles the browser viewer (web/viewer.ts with the engine and uPlot) into dist/web, with the
// page and its styles: everything the viewer needs is served locally, nothing comes from elsewhere.
import { build } from "esbuild";
import { copyFileSync, mkdirSync } from "node:fs";

mkdirSync("dist/web", { recursive: true });
await build({
  entryPoints: ["web/viewer.ts"],
  bundle: true,
  format: "esm",
  platform: "browser",
  target: "es2022",
  outfile: "dist/web/viewer.js",
  minify: true,
  sourcemap: true,
  logLevel: "warning",
});
copyFileSync("web/index.html", "dist/web/index.html");
copyFileSync("web/style.css", "dist/web/style.css");
copyFileSync("node_modules/uplot/dist/uPlot.min.css", "dist/web/uPlot.min.css");
