import { isAscii } from 'node:buffer';
import { createHash } from 'node:crypto';
import { createReadStream, statSync } from 'node:fs';
import { basename } from 'node:path';
import { HoldoutInputError } from './errors';
import { formatCount } from '@shared/format';

/**
 * Where a holdout's bytes come from: a file on disk (the CLI, and uploads after multer has
 * written them to disk) or bytes already in memory (tests, small inputs). The reader streams
 * either in 256 KB chunks and never holds the whole file as text.
 */
export type HoldoutSource = ({ path: string; fileName?: string } | { bytes: Uint8Array; fileName: string }) & {
  /** For an .xlsx workbook: the sheet to read (default: the first). */
  sheet?: string | null;
};

export interface SourceInfo {
  fileName: string;
  bytes: number;
  /** Hex SHA-256 of the bytes, filled in when the stream has been read to the end. */
  sha256: string;
  /** The worksheet read, for an .xlsx workbook (set once the workbook is open); absent for CSV. */
  sheet?: string;
}

const CHUNK = 1 << 18;

/**
 * One chunk of the source as read (256 KB or less): its bytes, and its text unless the file has
 * been ASCII so far — an ASCII chunk is its own text (Latin-1 bytes), which the reader then takes
 * straight from the bytes or copies into a string only when it needs one (asText).
 */
export interface SourceChunk {
  bytes: Uint8Array;
  /** The chunk's text (UTF-8 decoded, BOM removed) once the file has had a byte above 127; else undefined. */
  text: string | undefined;
}

/** The text of a chunk: its decoded text, or its ASCII bytes copied into a string. */
export function asText(chunk: SourceChunk): string {
  if (chunk.text !== undefined) return chunk.text;
  const { bytes } = chunk;
  return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('latin1');
}

/**
 * Streams the source as chunks of bytes (UTF-8 BOM removed), hashing the bytes on the way, with
 * their text once the file stops being ASCII (SourceChunk). Rejects binary input: bytes that are
 * not UTF-8 (UTF-16 is named as such), NUL characters, or the signature of a ZIP (xlsx) or gzip
 * file. Every check is made before the chunk is handed over.
 */
export async function* sourceChunks(source: HoldoutSource, info: SourceInfo, onBytes?: (read: number) => void): AsyncGenerator<SourceChunk> {
  const hash = createHash('sha256');
  // A UTF-8 BOM at the start is taken off here; the decoder, fed only from the first byte above
  // 127 on, must then keep any later U+FEFF as text (ignoreBOM), as it would have had it been fed
  // the file from its start.
  let decoder: InstanceType<typeof TextDecoder> | null = null;
  let bomRemoved = false;
  let read = 0;
  let first = true;
  // While every chunk has been ASCII (UTF-8 as it is) the decoder has been fed nothing: a chunk of
  // ASCII is then its own text (much faster than decoding, and not even copied into a string).
  let asciiSoFar = true;
  const take = (raw: Uint8Array, last: boolean): SourceChunk => {
    let chunk = raw;
    if (first && chunk.length > 0) {
      first = false;
      if (chunk[0] === 0x50 && chunk[1] === 0x4b && chunk[2] === 0x03 && chunk[3] === 0x04) {
        throw new HoldoutInputError('binary_file', 'the file is a ZIP archive (an .xlsx workbook?), not CSV text: save the sheet as CSV');
      }
      if (chunk[0] === 0x1f && chunk[1] === 0x8b) {
        throw new HoldoutInputError('binary_file', 'the file is gzip-compressed, not CSV text: decompress it first');
      }
      const utf16 = utf16Kind(chunk);
      if (utf16) throw new HoldoutInputError('not_utf8', `the file is UTF-16 text (${utf16}), not UTF-8: save it as CSV in UTF-8`);
      if (chunk.length >= 3 && chunk[0] === 0xef && chunk[1] === 0xbb && chunk[2] === 0xbf) {
        chunk = chunk.subarray(3);
        bomRemoved = true;
      }
    }
    if (asciiSoFar && isAscii(chunk)) {
      if (chunk.indexOf(0) !== -1) throw nulBytes();
      return { bytes: chunk, text: undefined };
    }
    asciiSoFar = false;
    decoder ??= new TextDecoder('utf-8', { fatal: true, ignoreBOM: bomRemoved });
    let text: string;
    try {
      text = decoder.decode(chunk, { stream: !last });
    } catch {
      throw new HoldoutInputError(
        'not_utf8',
        `the file is not UTF-8 text (invalid bytes within the first ${formatCount(read + raw.length)} bytes): save it as CSV in UTF-8`,
      );
    }
    if (text.indexOf('\0') !== -1) throw nulBytes();
    return { bytes: chunk, text };
  };

  if ('bytes' in source) {
    const all = source.bytes;
    info.bytes = all.length;
    for (let at = 0; at < all.length; at += CHUNK) {
      const raw = all.subarray(at, Math.min(all.length, at + CHUNK));
      hash.update(raw);
      const chunk = take(raw, at + CHUNK >= all.length);
      read += raw.length;
      onBytes?.(read);
      if (chunk.bytes.length > 0) yield chunk;
    }
  } else {
    info.bytes = statSync(source.path).size;
    const stream = createReadStream(source.path, { highWaterMark: CHUNK });
    try {
      for await (const raw of stream as AsyncIterable<Buffer>) {
        hash.update(raw);
        const chunk = take(raw, false);
        read += raw.length;
        onBytes?.(read);
        if (chunk.bytes.length > 0) yield chunk;
      }
      if (!asciiSoFar) {
        const tail = take(new Uint8Array(0), true);
        if (tail.text!.length > 0) yield tail;
      }
    } finally {
      stream.destroy();
    }
  }
  info.bytes = read;
  info.sha256 = hash.digest('hex');
}

const nulBytes = () => new HoldoutInputError('binary_file', 'the file contains NUL bytes: it is binary, not CSV text');

/** The source as UTF-8 text chunks (BOM removed), hashed on the way: sourceChunks as text. */
export async function* textChunks(source: HoldoutSource, info: SourceInfo, onBytes?: (read: number) => void): AsyncGenerator<string> {
  for await (const chunk of sourceChunks(source, info, onBytes)) {
    const text = asText(chunk);
    if (text.length > 0) yield text;
  }
}

/**
 * Whether the file's first bytes are UTF-16: a byte-order mark (FF FE little-endian, FE FF
 * big-endian), or — without one — text whose every other byte is NUL, as ASCII text is in UTF-16.
 */
function utf16Kind(chunk: Uint8Array): string | null {
  if (chunk[0] === 0xff && chunk[1] === 0xfe) return 'little-endian, with a byte-order mark';
  if (chunk[0] === 0xfe && chunk[1] === 0xff) return 'big-endian, with a byte-order mark';
  const pairs = Math.min(64, chunk.length >> 1);
  if (pairs < 4) return null;
  let evenNul = 0;
  let oddNul = 0;
  for (let i = 0; i < pairs; i++) {
    if (chunk[2 * i] === 0) evenNul++;
    if (chunk[2 * i + 1] === 0) oddNul++;
  }
  if (oddNul === pairs && evenNul === 0) return 'little-endian';
  if (evenNul === pairs && oddNul === 0) return 'big-endian';
  return null;
}

export function sourceInfo(source: HoldoutSource): SourceInfo {
  const fileName = source.fileName ?? ('path' in source ? basename(source.path) : 'holdout.csv');
  return { fileName, bytes: 0, sha256: '' };
}
