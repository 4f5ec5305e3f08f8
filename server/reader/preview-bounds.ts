/**
 * The preview's bounds: each cell at most PREVIEW_CELL_CHARS characters (longer ones are cut and
 * end in "…"), and the whole preview at most PREVIEW_MAX_BYTES of UTF-8 (rows after the budget are
 * left out; the first row is always kept, its cells cut further if it alone is over). A file with
 * megabyte-long fields or a hundred thousand columns thus stores and serves a preview of a few
 * dozen kilobytes, not the file.
 */

export const PREVIEW_CELL_CHARS = 200;
export const PREVIEW_MAX_BYTES = 64 * 1024;

/** `text` cut to `max` characters (UTF-16 units, never splitting a surrogate pair) plus "…". */
export function cutCell(text: string, max = PREVIEW_CELL_CHARS): string {
  if (text.length <= max) return text;
  let end = max - 1;
  const last = text.charCodeAt(end - 1);
  if (last >= 0xd800 && last <= 0xdbff) end -= 1;
  return `${text.slice(0, end)}…`;
}

/** The rows within the bounds above. */
export function boundPreview(rows: readonly (readonly string[])[]): string[][] {
  const kept: string[][] = [];
  let bytes = 2;
  for (const row of rows) {
    let cells = row.map((cell) => cutCell(cell));
    // JSON: quotes, commas and brackets around each cell; UTF-8 bytes of the text.
    let size = 2 + cells.reduce((sum, cell) => sum + Buffer.byteLength(cell) + 3, 0);
    if (kept.length === 0 && bytes + size > PREVIEW_MAX_BYTES) {
      // One row over the budget alone (a very wide file): its cells share what there is.
      const each = Math.max(1, Math.floor((PREVIEW_MAX_BYTES - 2) / Math.max(1, cells.length) / 4) - 3);
      cells = cells.map((cell) => cutCell(cell, each));
      size = 2 + cells.reduce((sum, cell) => sum + Buffer.byteLength(cell) + 3, 0);
      kept.push(cells);
      bytes += size;
      continue;
    }
    if (bytes + size > PREVIEW_MAX_BYTES) break;
    kept.push(cells);
    bytes += size;
  }
  return kept;
}
