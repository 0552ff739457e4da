/** The few fontkit calls the report uses (the package ships no types). */
declare module "fontkit" {
  export interface Font {
    readonly postscriptName: string;
    /** Every code point the font's cmap maps to a glyph. */
    readonly characterSet: number[];
    hasGlyphForCodePoint(codePoint: number): boolean;
  }
  export function create(buffer: Uint8Array, postscriptName?: string): Font;
}
