/**
 * Text from a JSON body made well-formed UTF-16: a lone surrogate (`"\ud800"` in the JSON) becomes
 * U+FFFD, the replacement character. SQLite stores text as UTF-8, which cannot hold a lone
 * surrogate, so without this a note was stored with U+FFFD while its audit record (canonical JSON,
 * which escapes the surrogate) kept the original: the two no longer matched. Now both hold the
 * same text from the start.
 */
const loneSurrogate = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

export function wellFormed(text: string): string {
  return text.replace(loneSurrogate, '\uFFFD');
}

/** A JSON.parse reviver for express.json: every string value and key well-formed. */
export function wellFormedReviver(_key: string, value: unknown): unknown {
  if (typeof value === 'string') return wellFormed(value);
  if (value !== null && typeof value === 'object' && !Array.isArray(value)) {
    for (const key of Object.keys(value)) {
      const fixed = wellFormed(key);
      if (fixed !== key) {
        (value as Record<string, unknown>)[fixed] = (value as Record<string, unknown>)[key];
        delete (value as Record<string, unknown>)[key];
      }
    }
  }
  return value;
}
