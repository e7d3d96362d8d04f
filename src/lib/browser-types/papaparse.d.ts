// The browser half of `papaparse` (parse a File or a string, unparse rows), as the client and shared code
// use it. The published `@types/papaparse` pulls in Node's types (for its stream mode), which would make
// `process`, `Buffer` and `require` look available in browser code, so the client project
// (tsconfig.client.json) maps `papaparse` here; the server keeps the published declarations.

export interface ParseError {
  type: 'Quotes' | 'Delimiter' | 'FieldMismatch';
  code: 'MissingQuotes' | 'UndetectableDelimiter' | 'TooFewFields' | 'TooManyFields' | 'InvalidQuotes';
  message: string;
  row?: number;
  index?: number;
}

export interface ParseMeta {
  delimiter: string;
  linebreak: string;
  aborted: boolean;
  fields?: string[];
  truncated: boolean;
  cursor: number;
  renamedHeaders?: Record<string, string>;
}

export interface ParseResult<T> {
  data: T[];
  errors: ParseError[];
  meta: ParseMeta;
}

export interface ParseConfig {
  delimiter?: string;
  newline?: '\r' | '\n' | '\r\n';
  quoteChar?: string;
  escapeChar?: string;
  header?: boolean;
  transformHeader?(header: string, index: number): string;
  dynamicTyping?: boolean;
  preview?: number;
  comments?: false | string;
  skipEmptyLines?: boolean | 'greedy';
  transform?(value: string, field: string | number): unknown;
  delimitersToGuess?: string[];
  skipFirstNLines?: number;
}

export interface ParseFileConfig<T> extends ParseConfig {
  encoding?: string;
  complete(results: ParseResult<T>, file: File): void;
  error?(error: Error, file: File): void;
}

export interface UnparseConfig {
  quotes?: boolean | boolean[] | ((value: unknown, columnIndex: number) => boolean);
  quoteChar?: string;
  escapeChar?: string;
  delimiter?: string;
  header?: boolean;
  newline?: string;
  skipEmptyLines?: boolean | 'greedy';
  columns?: string[];
  escapeFormulae?: boolean | RegExp;
}

export interface UnparseObject<T> {
  fields: string[];
  data: T[];
}

export function parse<T>(file: File, config: ParseFileConfig<T>): void;
export function parse<T>(csvString: string, config?: ParseConfig): ParseResult<T>;
export function unparse<T>(data: T[] | UnparseObject<T>, config?: UnparseConfig): string;

declare const Papa: { parse: typeof parse; unparse: typeof unparse };
export default Papa;
