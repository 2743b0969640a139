/** Line and column (both 1-based) of a character offset in a text. */
export interface TextPosition {
  readonly line: number;
  readonly column: number;
}

/**
 * 1-based line and column of `offset` (UTF-16 code units, as JavaScript strings count).
 * Lines end at "\n" ("\r\n" counts as one line end); an offset past the end is clamped.
 */
export function positionAt(text: string, offset: number): TextPosition {
  const end = Math.max(0, Math.min(offset, text.length));
  let line = 1;
  let lineStart = 0;
  for (let i = 0; i < end; i++) {
    if (text.charCodeAt(i) === 10) {
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: end - lineStart + 1 };
}
