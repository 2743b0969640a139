/**
 * The parts of the untyped export libraries that src/report/export.ts and src/report/font.ts use
 * (fontkit, pdfkit and svg-to-pdfkit ship no type declarations).
 */
declare module 'fontkit' {
  export interface Glyph {
    readonly advanceWidth: number;
  }
  export interface GlyphRun {
    readonly advanceWidth: number;
  }
  export interface Font {
    readonly unitsPerEm: number;
    readonly ascent: number;
    readonly descent: number;
    layout(text: string): GlyphRun;
  }
  export function openSync(path: string): Font;
}

declare module 'pdfkit' {
  interface PdfOptions {
    size: [number, number];
    margin: number;
    compress?: boolean;
    info?: Record<string, string | Date>;
    pdfVersion?: string;
  }
  class PDFDocument {
    constructor(options: PdfOptions);
    on(event: 'data', listener: (chunk: Buffer) => void): this;
    on(event: 'end', listener: () => void): this;
    end(): void;
  }
  export default PDFDocument;
}

declare module 'svg-to-pdfkit' {
  import type PDFDocument from 'pdfkit';
  export default function SVGtoPDF(doc: PDFDocument, svg: string, x: number, y: number, options?: { width?: number; height?: number; assumePt?: boolean; preserveAspectRatio?: string }): void;
}
