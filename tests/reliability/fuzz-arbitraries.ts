import fc from 'fast-check';

/**
 * What a careless client, a broken form or someone probing the API sends: the generators behind
 * tests/reliability/fuzz-write-routes.test.ts. Each mutation starts from a request the authorization
 * matrix knows to be valid (tests/api/authz/*.ts) and breaks one to three things in it.
 */

/** Strings that trip up parsers, databases and text handling. */
const NASTY_STRINGS = [
  '',
  ' ',
  '\u0000',
  'bench\u0000note',
  '\ud800', // a lone high surrogate
  'pad\udfffcup', // a lone low surrogate
  '\u200f\u202eevah\u202c', // right-to-left mark and override
  'e\u0301\u0301\u0301\u0301', // combining accents stacked on one letter
  'Z\u0336\u0351\u0322a\u0338\u0340l\u0337g\u0335o',
  '\ufeffbyte order mark',
  '\u2028\u2029',
  '\r\n\t',
  'NaN',
  'Infinity',
  '-Infinity',
  'null',
  'undefined',
  'true',
  '1e309',
  '-0',
  '0x1F',
  ' 12 ',
  '12abc',
  '-1',
  '9'.repeat(40),
  '2026-02-30',
  '9999-12-31T23:59:60Z',
  '0000-00-00',
  '00000000-0000-0000-0000-000000000000',
  'ffffffff-ffff-ffff-ffff-ffffffffffff',
  '../../etc/passwd',
  "'; drop table jobs; --",
  '%00',
  '%s%n',
  '${7*7}',
  '<script>alert(1)</script>',
  '__proto__',
  'constructor',
  'x'.repeat(10_000),
  '\u00e9'.repeat(5_000),
  '\ud83c\udfb7'.repeat(3_000), // saxophone emoji, 4 bytes each in UTF-8
];

const NASTY_NUMBERS = [
  0, -0, -1, 1, -2147483649, 2147483648, Number.MAX_SAFE_INTEGER, Number.MAX_SAFE_INTEGER + 2, -Number.MAX_SAFE_INTEGER,
  1e308, -1e308, 5e-324, 0.1, 0.30000000000000004, 1.5, -99.99, 1e21,
];

export const nastyString = fc.oneof(
  { weight: 3, arbitrary: fc.constantFrom(...NASTY_STRINGS) },
  { weight: 2, arbitrary: fc.string({ unit: 'binary', maxLength: 40 }) },
  { weight: 1, arbitrary: fc.string({ unit: 'grapheme-composite', maxLength: 20 }) },
  { weight: 1, arbitrary: fc.string({ unit: 'binary-ascii', maxLength: 40 }) },
  { weight: 1, arbitrary: fc.string({ unit: fc.constantFrom('\ud800', '\udc00', '\u0000', '\u200f', '\u0301', 'a'), maxLength: 12 }) },
);

export const nastyNumber = fc.oneof(
  fc.constantFrom(...NASTY_NUMBERS),
  fc.integer(),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
);

/** Any JSON value that is likely of the wrong type, size or shape for the field it lands in. */
export const nastyValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 4, arbitrary: nastyString },
  { weight: 3, arbitrary: nastyNumber },
  { weight: 1, arbitrary: fc.constantFrom(null, true, false) },
  { weight: 1, arbitrary: fc.constantFrom([], {}, [null], [''], { '': '' }, JSON.parse('{"__proto__":{"owner":true}}') as unknown) },
  { weight: 1, arbitrary: fc.array(fc.oneof(nastyString, nastyNumber), { maxLength: 4 }) },
  { weight: 1, arbitrary: fc.dictionary(nastyString, fc.oneof(nastyString, nastyNumber), { maxKeys: 3 }) },
  { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 3 }) },
);

/** A value for an id: another network's record, a made-up id, or not an id at all. */
export const idKindValue = fc.oneof(
  { weight: 3, arbitrary: fc.constant({ otherNetwork: true as const }) },
  { weight: 1, arbitrary: fc.uuid().map((id) => ({ raw: id })) },
  { weight: 2, arbitrary: nastyValue.map((v) => ({ raw: v })) },
);

export type Mutation =
  | { kind: 'replace'; pick: number; value: unknown }
  | { kind: 'remove'; pick: number }
  | { kind: 'add'; key: string; value: unknown }
  | { kind: 'id'; pick: number; value: { otherNetwork: true } | { raw: unknown } }
  | { kind: 'path'; pick: number; value: { otherNetwork: true } | { raw: unknown } };

/** A whole request body that is not what any route reads. */
export type WholeBody =
  | { kind: 'body'; value: unknown }
  | { kind: 'raw'; text: string }
  | { kind: 'huge' };

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  { weight: 5, arbitrary: fc.record({ kind: fc.constant('replace' as const), pick: fc.nat(), value: nastyValue }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('remove' as const), pick: fc.nat() }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('add' as const), key: fc.oneof(nastyString, fc.constantFrom('networkId', 'id', 'shopId', 'state', 'createdAt', '__proto__')), value: nastyValue }) },
  { weight: 3, arbitrary: fc.record({ kind: fc.constant('id' as const), pick: fc.nat(), value: idKindValue }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('path' as const), pick: fc.nat(), value: idKindValue }) },
);

const MALFORMED_JSON = ['{', '{"a":', '[1,2', '{"a":1,}', "{'a':1}", '\u0000', 'null', '"text"', '12', '{"a":"\\ud800"}', '{"a":"\\u0000"}'];

const wholeBody: fc.Arbitrary<WholeBody> = fc.oneof(
  { weight: 2, arbitrary: nastyValue.map((value) => ({ kind: 'body' as const, value })) },
  { weight: 1, arbitrary: fc.constantFrom(...MALFORMED_JSON).map((text) => ({ kind: 'raw' as const, text })) },
  { weight: 1, arbitrary: fc.constant({ kind: 'huge' as const }) },
);

/** One generated request: usually a few mutations of a valid body, sometimes a body that is wrong as a whole. */
export const fuzzCase: fc.Arbitrary<{ mutations: Mutation[] } | WholeBody> = fc.oneof(
  { weight: 9, arbitrary: fc.array(mutation, { minLength: 1, maxLength: 3 }).map((mutations) => ({ mutations })) },
  { weight: 1, arbitrary: wholeBody },
);
