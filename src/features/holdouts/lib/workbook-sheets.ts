/**
 * The worksheet names of an .xlsx workbook, read in the browser before the upload so the modeler
 * can choose the sheet that holds the holdout. An .xlsx file is a ZIP archive; its sheet names, in
 * the order the workbook shows them, are the `<sheet name="…">` elements of `xl/workbook.xml`.
 * Only the archive's central directory (at the end of the file) and that one entry are read
 * (Blob.slice), so a large workbook is not loaded whole; a deflated entry is inflated with the
 * browser's DecompressionStream('deflate-raw'). Formats: PKWARE's APPNOTE.TXT (the ZIP file
 * format, sections 4.3.7, 4.3.12 and 4.3.16) and ECMA-376 Part 1, §18.2.19 (the sheet element).
 *
 * Anything this cannot read (not a ZIP, ZIP64, encryption, an unusual layout) gives null: the
 * upload then goes without a sheet and the server reads the first one, or says what is wrong.
 */

const EOCD_SIGNATURE = 0x06054b50;
const CENTRAL_SIGNATURE = 0x02014b50;
const LOCAL_SIGNATURE = 0x04034b50;
/** The end-of-central-directory record is 22 bytes plus a comment of at most 65,535. */
const EOCD_SEARCH = 22 + 0xffff;
/** workbook.xml lists sheets and defined names; a few megabytes at most in real workbooks. */
const MAX_WORKBOOK_XML = 16 * 1024 * 1024;

async function bytesOf(file: Blob, start: number, end: number): Promise<DataView> {
  return new DataView(await file.slice(start, end).arrayBuffer());
}

async function inflateRaw(data: ArrayBuffer): Promise<ArrayBuffer> {
  const stream = new Blob([data]).stream().pipeThrough(new DecompressionStream('deflate-raw'));
  return new Response(stream).arrayBuffer();
}

const entities: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };

/** XML attribute text: the five named entities and numeric character references. */
export function decodeXmlText(text: string): string {
  return text.replace(/&(#x[0-9a-f]+|#\d+|amp|lt|gt|quot|apos);/gi, (whole, name: string) => {
    if (name[0] === '#') {
      const code = name[1] === 'x' || name[1] === 'X' ? parseInt(name.slice(2), 16) : parseInt(name.slice(1), 10);
      return Number.isFinite(code) && code <= 0x10ffff ? String.fromCodePoint(code) : whole;
    }
    return entities[name.toLowerCase()] ?? whole;
  });
}

/** The `name` of each `<sheet>` element of workbook.xml, in order (any namespace prefix). */
export function sheetNamesOf(workbookXml: string): string[] {
  const names: string[] = [];
  for (const match of workbookXml.matchAll(/<(?:[A-Za-z_][\w.-]*:)?sheet\s([^>]*?)\/?>/g)) {
    const name = /(?:^|\s)name\s*=\s*(?:"([^"]*)"|'([^']*)')/.exec(match[1]);
    if (name) names.push(decodeXmlText(name[1] ?? name[2]));
  }
  return names;
}

/** The sheet names of an .xlsx workbook, or null when the file cannot be read as one. */
export async function workbookSheetNames(file: Blob): Promise<string[] | null> {
  try {
    const tailStart = Math.max(0, file.size - EOCD_SEARCH);
    const tail = await bytesOf(file, tailStart, file.size);
    let eocd = -1;
    for (let at = tail.byteLength - 22; at >= 0; at--) {
      if (tail.getUint32(at, true) === EOCD_SIGNATURE) {
        eocd = at;
        break;
      }
    }
    if (eocd === -1) return null;
    const entries = tail.getUint16(eocd + 10, true);
    const directorySize = tail.getUint32(eocd + 12, true);
    const directoryOffset = tail.getUint32(eocd + 16, true);
    if (directoryOffset === 0xffffffff || directoryOffset + directorySize > file.size) return null;
    const directory = await bytesOf(file, directoryOffset, directoryOffset + directorySize);
    const decoder = new TextDecoder();
    let at = 0;
    for (let entry = 0; entry < entries && at + 46 <= directory.byteLength; entry++) {
      if (directory.getUint32(at, true) !== CENTRAL_SIGNATURE) return null;
      const flags = directory.getUint16(at + 8, true);
      const method = directory.getUint16(at + 10, true);
      const compressedSize = directory.getUint32(at + 20, true);
      const nameLength = directory.getUint16(at + 28, true);
      const extraLength = directory.getUint16(at + 30, true);
      const commentLength = directory.getUint16(at + 32, true);
      const localOffset = directory.getUint32(at + 42, true);
      const name = decoder.decode(new Uint8Array(directory.buffer, directory.byteOffset + at + 46, nameLength));
      at += 46 + nameLength + extraLength + commentLength;
      if (name !== 'xl/workbook.xml') continue;
      if ((flags & 1) !== 0 || (method !== 0 && method !== 8) || compressedSize > MAX_WORKBOOK_XML) return null;
      const local = await bytesOf(file, localOffset, localOffset + 30);
      if (local.getUint32(0, true) !== LOCAL_SIGNATURE) return null;
      const dataStart = localOffset + 30 + local.getUint16(26, true) + local.getUint16(28, true);
      const data = await file.slice(dataStart, dataStart + compressedSize).arrayBuffer();
      const xml = decoder.decode(method === 8 ? await inflateRaw(data) : data);
      const names = sheetNamesOf(xml);
      return names.length > 0 ? names : null;
    }
    return null;
  } catch {
    return null;
  }
}

/** Whether a chosen file looks like an .xlsx workbook (by its name or type). */
export function looksLikeWorkbook(file: { name: string; type: string }): boolean {
  return /\.xlsx$/i.test(file.name) || file.type === 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';
}
