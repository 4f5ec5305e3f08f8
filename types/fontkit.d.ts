/** The little of fontkit 2 that the PDF pack uses (the package ships no types). */
declare module 'fontkit' {
  export interface Font {
    hasGlyphForCodePoint(codePoint: number): boolean;
  }
  export function create(buffer: Uint8Array): Font;
}
