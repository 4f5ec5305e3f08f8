import { inflateSync } from 'node:zlib';

/**
 * WOFF 1.0 → the OpenType/TrueType font it wraps (W3C, "WOFF File Format 1.0", 2012): each table
 * is inflated once and laid out again behind an sfnt table directory. fontkit can read WOFF
 * itself, but it inflates a table again on every access, which made a pack take seconds; the
 * fonts are converted once per process instead. Cost: O(size of the font).
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.toString('latin1', 0, 4) !== 'wOFF') throw new Error('not a WOFF 1.0 font');
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const tables: { tag: number; checksum: number; data: Buffer }[] = [];
  for (let i = 0; i < numTables; i++) {
    const at = 44 + i * 20;
    const tag = woff.readUInt32BE(at);
    const offset = woff.readUInt32BE(at + 4);
    const compLength = woff.readUInt32BE(at + 8);
    const origLength = woff.readUInt32BE(at + 12);
    const checksum = woff.readUInt32BE(at + 16);
    const raw = woff.subarray(offset, offset + compLength);
    const data = compLength < origLength ? inflateSync(raw) : Buffer.from(raw);
    if (data.length !== origLength) throw new Error(`WOFF table ${i}: ${data.length} bytes, expected ${origLength}`);
    tables.push({ tag, checksum, data });
  }
  tables.sort((a, b) => a.tag - b.tag);
  let entrySelector = 0;
  while (2 ** (entrySelector + 1) <= numTables) entrySelector++;
  const searchRange = 2 ** entrySelector * 16;
  const headerSize = 12 + numTables * 16;
  const total = headerSize + tables.reduce((sum, table) => sum + ((table.data.length + 3) & ~3), 0);
  const out = Buffer.alloc(total);
  out.writeUInt32BE(flavor, 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(searchRange, 6);
  out.writeUInt16BE(entrySelector, 8);
  out.writeUInt16BE(numTables * 16 - searchRange, 10);
  let offset = headerSize;
  tables.forEach((table, i) => {
    const at = 12 + i * 16;
    out.writeUInt32BE(table.tag, at);
    out.writeUInt32BE(table.checksum, at + 4);
    out.writeUInt32BE(offset, at + 8);
    out.writeUInt32BE(table.data.length, at + 12);
    table.data.copy(out, offset);
    offset += (table.data.length + 3) & ~3;
  });
  return out;
}
