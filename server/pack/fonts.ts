import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { create, type Font } from 'fontkit';
import { woffToSfnt } from './woff';

/**
 * The PDF's fonts: Work Sans (the product's typeface, the WOFF files of @fontsource/work-sans:
 * pdfkit embeds WOFF through fontkit, its WOFF2 decoding fails on these files) for all text, and
 * DejaVu Sans (@fontsource/dejavu-sans) for the few characters Work Sans's Latin files lack: Greek
 * (α, Δ), superscript digits of p-values, arrows and ≥. Text is split into runs by which font has
 * the glyph, so nothing prints as an empty box. Both subsets are embedded, only the glyphs used.
 */

const require = createRequire(import.meta.url);

function fontFile(pkg: string, file: string): string {
  return join(dirname(require.resolve(`${pkg}/package.json`)), 'files', file);
}

export const fontFiles = {
  regular: fontFile('@fontsource/work-sans', 'work-sans-latin-400-normal.woff'),
  bold: fontFile('@fontsource/work-sans', 'work-sans-latin-600-normal.woff'),
  fallback: fontFile('@fontsource/dejavu-sans', 'dejavu-sans-latin-400-normal.woff'),
  fallbackBold: fontFile('@fontsource/dejavu-sans', 'dejavu-sans-latin-700-normal.woff'),
} as const;

export type FontName = keyof typeof fontFiles;

let loaded: Record<FontName, Buffer> | null = null;

/** The four faces as TrueType bytes (converted from WOFF once per process), for pdfkit's registerFont. */
export function fontBytes(): Record<FontName, Buffer> {
  loaded ??= Object.fromEntries(Object.entries(fontFiles).map(([name, file]) => [name, woffToSfnt(readFileSync(file))])) as Record<FontName, Buffer>;
  return loaded;
}

let primary: Font | null = null;

/** Whether Work Sans (the primary face) has a glyph for the character. */
export function primaryHas(codePoint: number): boolean {
  primary ??= create(fontBytes().regular);
  return primary.hasGlyphForCodePoint(codePoint);
}

export interface Run {
  text: string;
  font: FontName;
}

/** Splits text into runs of the primary face and of the fallback face. */
export function textRuns(text: string, bold: boolean): Run[] {
  const runs: Run[] = [];
  for (const char of text) {
    const code = char.codePointAt(0) as number;
    const font: FontName = code < 0x80 || primaryHas(code) ? (bold ? 'bold' : 'regular') : bold ? 'fallbackBold' : 'fallback';
    const last = runs[runs.length - 1];
    if (last && last.font === font) last.text += char;
    else runs.push({ text: char, font });
  }
  return runs;
}
