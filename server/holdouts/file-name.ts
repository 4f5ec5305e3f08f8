/**
 * The client's file name, made safe to show and to put in a report: only the last path segment
 * (either slash), no control or bidirectional-override characters, no leading dots, at most 200
 * characters (a longer name loses characters before its extension, so `….csv` stays `.csv`);
 * `holdout.csv` when nothing is left. It is never used as a path: stored files and
 * holdouts are named by the database's ids.
 */
const MAX_LENGTH = 200;

export function sanitiseFileName(original: string | undefined | null): string {
  if (!original) return 'holdout.csv';
  const lastSegment = original.split(/[/\\]/).pop() ?? '';
  const cleaned = lastSegment
    // C0/C1 controls, DEL, and the Unicode bidi overrides and isolates that can disguise an extension.
    // eslint-disable-next-line no-control-regex -- removing control characters is the point
    .replace(/[\u0000-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/g, '')
    .replace(/^[.\s]+/, '')
    .trim();
  if (cleaned.length === 0) return 'holdout.csv';
  const characters = [...cleaned];
  if (characters.length <= MAX_LENGTH) return cleaned;
  const extension = /\.[^.\s]{1,10}$/u.exec(cleaned)?.[0] ?? '';
  const extensionLength = [...extension].length;
  return characters.slice(0, MAX_LENGTH - extensionLength).join('').trimEnd() + extension;
}
