// The browser half of the `qrcode` package, as the client uses it. The published `@types/qrcode` pulls in
// Node's types, which would make `process`, `Buffer` and `require` look available in browser code, so the
// client project (tsconfig.client.json) maps `qrcode` here; the server keeps the published declarations.

export type QRCodeErrorCorrectionLevel = 'low' | 'medium' | 'quartile' | 'high' | 'L' | 'M' | 'Q' | 'H';

export interface QRCodeToStringOptions {
  type?: 'svg' | 'utf8' | 'terminal';
  errorCorrectionLevel?: QRCodeErrorCorrectionLevel;
  margin?: number;
  width?: number;
  scale?: number;
  color?: { dark?: string; light?: string };
}

export function toString(text: string, options?: QRCodeToStringOptions): Promise<string>;
export function toDataURL(text: string, options?: Omit<QRCodeToStringOptions, 'type'>): Promise<string>;

declare const QRCode: { toString: typeof toString; toDataURL: typeof toDataURL };
export default QRCode;
