// fontkit ships no type declarations; the reports use only `create`, whose font pdfkit accepts.
declare module 'fontkit' {
  export interface Font {
    layout(text: string, features?: string[]): unknown
  }
  export function create(buffer: Uint8Array, postscriptName?: string): Font
}
