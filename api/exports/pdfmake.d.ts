// pdfmake 0.3 ships no type declarations; this is the part of its server API Treadwise uses.
declare module 'pdfmake' {
  interface VirtualFileSystem {
    existsSync(filename: string): boolean;
    writeFileSync(filename: string, content: Buffer | string): void;
  }
  interface FontFaces {
    normal: string;
    bold: string;
    italics: string;
    bolditalics: string;
  }
  interface OutputDocument {
    getBuffer(): Promise<Buffer>;
  }
  interface PdfMake {
    virtualfs: VirtualFileSystem;
    setFonts(fonts: Record<string, FontFaces>): void;
    setUrlAccessPolicy(callback: (url: string) => boolean): void;
    setLocalAccessPolicy(callback: (path: string) => boolean): void;
    /** The document definition: content, styles, info… (see pdfmake's documentation). */
    createPdf(docDefinition: Record<string, unknown>, options?: Record<string, unknown>): OutputDocument;
  }
  const pdfmake: PdfMake;
  export default pdfmake;
}
