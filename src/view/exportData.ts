/**
 * What the viewer's exports carry besides the data: the calorbit version, the scenario's name, the
 * regime and every parameter the page computed with (and the SI case as JSON in the CSV), so an
 * exported file says where it came from. Pure: no DOM.
 */
import type { ThermalCase } from "../model/thermalCase.js";
import { PARAMETERS, usesParameter, SPIN_REGIMES, type ParameterValues } from "./parameters.js";

/** "e = 0.32, Bond albedo = 0.31, …" for the parameters the regime uses, in the page's units. */
export function parameterWords(v: ParameterValues): string {
  const parts = PARAMETERS.filter((p) => usesParameter(p, v.regime)).map((p) => `${p.label.replace(/ \(.*\)$/, "")} = ${v[p.key]}${unitOf(p.label)}`);
  if (SPIN_REGIMES.includes(v.regime)) parts.push(`spin = ${v.spin}`);
  return parts.join(", ");
}

function unitOf(label: string): string {
  const m = / \((.*)\)$/.exec(label);
  return m && !/^\d/.test(m[1]!) ? ` ${m[1]!.replace(/^deg$/, "°").replace(/ \(.*\)/, "")}` : "";
}

export interface ExportColumn {
  name: string;
  values: ArrayLike<number>;
}

export interface ExportHeader {
  version: string;
  name: string;
  values: ParameterValues;
  thermal: ThermalCase;
  /** The view's query string (a link to the same view). */
  link: string;
}

/** The header lines shared by both exports (without the '#'). */
export function exportHeaderLines(h: ExportHeader): string[] {
  return [`calorbit ${h.version} viewer export — ${h.name}`, `regime: ${h.values.regime}; ${parameterWords(h.values)}`];
}

/** The series as CSV: '#' lines with the version, the parameters, the view's link and the case (SI, JSON). */
export function viewerCsv(h: ExportHeader, columns: readonly ExportColumn[]): string {
  const lines = [
    ...exportHeaderLines(h).map((l) => `# ${l}`),
    `# view: ?${h.link}`,
    `# case (SI units): ${JSON.stringify(h.thermal)}`,
    columns.map((c) => c.name).join(","),
  ];
  const n = columns[0]?.values.length ?? 0;
  for (let i = 0; i < n; i++) lines.push(columns.map((c) => c.values[i]!.toPrecision(10)).join(","));
  return lines.join("\n") + "\n";
}

const CRC_TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

/** CRC-32 as PNG chunks use it (ISO 3309; PNG specification, annex D). */
export function crc32(bytes: Uint8Array): number {
  let c = 0xffffffff;
  for (let i = 0; i < bytes.length; i++) c = CRC_TABLE[(c ^ bytes[i]!) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

/**
 * A PNG with international text chunks (`iTXt`, PNG specification §11.3.4.5: a Latin-1 keyword, a
 * zero byte, compression flag and method 0, empty language tag and translated keyword, UTF-8 text)
 * added before its IEND chunk.
 */
export function pngWithText(png: Uint8Array, entries: Readonly<Record<string, string>>): Uint8Array {
  const utf8 = new TextEncoder();
  const chunks: Uint8Array[] = [];
  for (const [keyword, text] of Object.entries(entries)) {
    const k = Uint8Array.from(keyword.slice(0, 79), (ch) => (ch.charCodeAt(0) < 256 ? ch.charCodeAt(0) : 63));
    const v = utf8.encode(text);
    // type, keyword, 0, compression flag 0, method 0, language "" + 0, translated keyword "" + 0, text
    const data = new Uint8Array(4 + k.length + 5 + v.length);
    data.set([0x69, 0x54, 0x58, 0x74], 0); // "iTXt"
    data.set(k, 4);
    data.set(v, 4 + k.length + 5);
    const chunk = new Uint8Array(8 + data.length);
    const view = new DataView(chunk.buffer);
    view.setUint32(0, data.length - 4);
    chunk.set(data, 4);
    view.setUint32(chunk.length - 4, crc32(data));
    chunks.push(chunk);
  }
  const iend = png.length - 12; // the IEND chunk: length 0, "IEND", CRC
  const extra = chunks.reduce((n, c) => n + c.length, 0);
  const out = new Uint8Array(png.length + extra);
  out.set(png.subarray(0, iend), 0);
  let at = iend;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  out.set(png.subarray(iend), at);
  return out;
}

/** The uncompressed `iTXt` and `tEXt` chunks of a PNG, keyword → text (to read back what an export carries). */
export function pngTextChunks(png: Uint8Array): Record<string, string> {
  const out: Record<string, string> = {};
  const view = new DataView(png.buffer, png.byteOffset, png.byteLength);
  const utf8 = new TextDecoder();
  let at = 8;
  while (at + 12 <= png.length) {
    const length = view.getUint32(at);
    const type = String.fromCharCode(...png.subarray(at + 4, at + 8));
    const data = png.subarray(at + 8, at + 8 + length);
    const zero = data.indexOf(0);
    if (type === "tEXt") {
      out[String.fromCharCode(...data.subarray(0, zero))] = Array.from(data.subarray(zero + 1), (b) => String.fromCharCode(b)).join("");
    } else if (type === "iTXt" && data[zero + 1] === 0) {
      const language = data.indexOf(0, zero + 3);
      const translated = data.indexOf(0, language + 1);
      out[String.fromCharCode(...data.subarray(0, zero))] = utf8.decode(data.subarray(translated + 1));
    }
    at += 12 + length;
  }
  return out;
}
