// One-off tool: unpacks a WOFF 1.0 file into the TrueType font it wraps (zlib per table).
// Used to make the label fonts from @fontsource/ibm-plex-sans; see README.md in this folder.
// Usage: node woff-to-ttf.mjs in.woff out.ttf
import { readFileSync, writeFileSync } from "node:fs";
import { inflateSync } from "node:zlib";

const [input, output] = process.argv.slice(2);
const woff = readFileSync(input);
if (woff.toString("latin1", 0, 4) !== "wOFF") throw new Error(`${input} is not a WOFF 1.0 file`);
const flavor = woff.readUInt32BE(4);
const numTables = woff.readUInt16BE(12);
const tables = [];
for (let i = 0; i < numTables; i++) {
  const at = 44 + i * 20;
  const tag = woff.toString("latin1", at, at + 4);
  const offset = woff.readUInt32BE(at + 4);
  const compLength = woff.readUInt32BE(at + 8);
  const origLength = woff.readUInt32BE(at + 12);
  const checksum = woff.readUInt32BE(at + 16);
  const raw = woff.subarray(offset, offset + compLength);
  const data = compLength < origLength ? inflateSync(raw) : raw;
  if (data.length !== origLength) throw new Error(`table ${tag}: ${data.length} bytes, expected ${origLength}`);
  tables.push({ tag, checksum, data });
}
tables.sort((a, b) => (a.tag < b.tag ? -1 : 1));
const pow2 = 2 ** Math.floor(Math.log2(numTables));
const header = Buffer.alloc(12 + 16 * numTables);
header.writeUInt32BE(flavor, 0);
header.writeUInt16BE(numTables, 4);
header.writeUInt16BE(pow2 * 16, 6);
header.writeUInt16BE(Math.log2(pow2), 8);
header.writeUInt16BE(numTables * 16 - pow2 * 16, 10);
let offset = header.length;
const chunks = [header];
tables.forEach((t, i) => {
  const at = 12 + i * 16;
  header.write(t.tag, at, "latin1");
  header.writeUInt32BE(t.checksum, at + 4);
  header.writeUInt32BE(offset, at + 8);
  header.writeUInt32BE(t.data.length, at + 12);
  const padded = Buffer.alloc(Math.ceil(t.data.length / 4) * 4);
  t.data.copy(padded);
  chunks.push(padded);
  offset += padded.length;
});
writeFileSync(output, Buffer.concat(chunks));
