import fc from 'fast-check';

/** Generators of hostile input, shared by the route and action fuzzers. */

export const MAX_JSON_BYTES = 256 * 1024;

export const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** Numbers that parse in surprising ways, sent as strings the way forms and query strings carry them. */
export const trickyNumberText = fc.constantFrom(
  'NaN', 'Infinity', '-Infinity', '1e308', '1e309', '-1e309', '-0', '0x1F', '0b11', '1_000', ' 1 ', '', ' ', '1e-400',
  '9007199254740993', '-0.5120000000001', '\u22120.512', '−0.512', '0,512', '.', '-', '+', '1e', '١٢٣', '00000000001', '-0.00000',
);

export const trickyNumber = fc.oneof(
  fc.constantFrom(Number.NaN, Infinity, -Infinity, -0, 1e308, -1e308, Number.MAX_SAFE_INTEGER + 2, Number.MIN_VALUE, -0.5120000001, 2 ** 31, -(2 ** 63)),
  fc.double(),
  fc.integer(),
);

const hostileText = fc.constantFrom(
  '\u0000', '\uD800', '\uDFFF\uD800', '\uFEFF', '\u202Eevil', 'e\u0301', '👩‍👩‍👧‍👦', '<script>alert(1)</script>', "' OR 1=1 --", "'; drop table dispute_case; --",
  '../../../etc/passwd', '%00', '%zz', '\r\nSet-Cookie: x=1', 'null', 'undefined', 'true', '[]', '{}', '__proto__', '{{7*7}}', '${7*7}',
  '00000000-0000-0000-0000-000000000000', 'ffffffff-ffff-ffff-ffff-ffffffffffff', '2026-13-45T25:61:61Z', '0000-00-00', '9999-12-31T23:59:59Z',
);

/** Long strings without paying for fast-check to build them character by character. */
export const hugeText = fc
  .tuple(fc.constantFrom('x', 'é', '😀', '\u0000', 'ab<'), fc.integer({ min: 4_000, max: 70_000 }))
  .map(([unit, n]) => unit.repeat(n));

export const nastyString = fc.oneof(
  { weight: 3, arbitrary: fc.string() },
  { weight: 2, arbitrary: fc.string({ unit: 'grapheme' }) },
  // Lone surrogates: strings JavaScript holds but UTF-8 cannot.
  { weight: 2, arbitrary: fc.string({ unit: 'binary' }) },
  { weight: 3, arbitrary: hostileText },
  { weight: 2, arbitrary: trickyNumberText },
  { weight: 1, arbitrary: fc.uuid().map((id) => id.toUpperCase()) },
  { weight: 1, arbitrary: hugeText },
);

export const protoKey = fc.constantFrom('__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty', 'valueOf', '__defineGetter__', 'then');

function nest(depth: number, leaf: unknown, asArray: boolean): unknown {
  let value = leaf;
  for (let i = 0; i < depth; i++) value = asArray ? [value] : { a: value };
  return value;
}

export const deepJson = fc.tuple(fc.integer({ min: 50, max: 3_000 }), fc.boolean()).map(([depth, asArray]) => nest(depth, 'deep', asArray));
/** Deep, but shallow enough for fast-check to print when it is a failing case's value rather than text. */
export const deepValue = fc.tuple(fc.integer({ min: 50, max: 600 }), fc.boolean()).map(([depth, asArray]) => nest(depth, 'deep', asArray));

/** JSON values with hostile leaves and keys, wrong types and prototype-pollution keys. */
export const nastyJson: fc.Arbitrary<unknown> = fc.letrec<{ value: unknown }>((tie) => ({
  value: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    nastyString,
    trickyNumber.filter(Number.isFinite),
    fc.boolean(),
    fc.constant(null),
    fc.array(tie('value'), { maxLength: 5 }),
    fc.dictionary(fc.oneof(fc.string(), protoKey), tie('value'), { maxKeys: 5 }),
  ),
})).value;

/** Objects that carry the target's own field names, each with a wrong or missing value, plus extras. */
export function nearMissObject(fieldNames: readonly string[], value: fc.Arbitrary<unknown> = nastyJson): fc.Arbitrary<Record<string, unknown>> {
  const own = fieldNames.length
    ? fc.record(Object.fromEntries(fieldNames.map((name) => [name, value])) as Record<string, fc.Arbitrary<unknown>>, { requiredKeys: [] })
    : fc.constant({});
  return fc.tuple(own, fc.dictionary(fc.oneof(fc.string(), protoKey), value, { maxKeys: 3 })).map(([fields, extra]) => {
    const merged: Record<string, unknown> = {};
    // Own keys (also '__proto__') as JSON.parse would make them, never through the prototype setter.
    for (const [k, v] of [...Object.entries(extra), ...Object.entries(fields)]) Object.defineProperty(merged, k, { value: v, enumerable: true, writable: true, configurable: true });
    return merged;
  });
}

/** JSON text that JSON.parse accepts but that is built to pollute prototypes or overflow numbers. */
export function hostileJsonText(fieldNames: readonly string[]): fc.Arbitrary<string> {
  const name = fieldNames.length ? fc.constantFrom(...fieldNames) : fc.constant('x');
  return fc.oneof(
    name.map((n) => `{"__proto__":{"${n}":"polluted","admin":true},"${n}":{"__proto__":null}}`),
    name.map((n) => `{"constructor":{"prototype":{"${n}":1}},"${n}":1e999}`),
    name.map((n) => `{"${n}":-0,"${n}":NaN}`),
    name.map((n) => `{"${n}":"\\ud800","${n}\\u0000":"\\u0000"}`),
    fc.constant('{"a":1,"a":2,"a":{"__proto__":[]}}'),
    fc.integer({ min: MAX_JSON_BYTES - 64, max: MAX_JSON_BYTES + 4_096 }).map((n) => JSON.stringify({ padding: 'p'.repeat(n) })),
  );
}

/** Bodies that are not JSON at all, or not valid UTF-8. */
export const rawBody: fc.Arbitrary<string | Uint8Array> = fc.oneof(
  fc.string(),
  fc.constantFrom('{', '{"a":', '[1,2', 'nul', "{'a':1}", '{"a":1}garbage', '\uFEFF{"a":1}', 'a=1&b=2', '<xml/>', '--boundary\r\n', ')]}\'\n{}'),
  fc.uint8Array({ maxLength: 512 }),
  fc.constant(new Uint8Array([0xc3, 0x28, 0xa0, 0xa1, 0xe2, 0x28, 0xa1, 0xf0, 0x28, 0x8c, 0xbc, 0xff, 0xfe])),
  fc.integer({ min: MAX_JSON_BYTES + 1, max: MAX_JSON_BYTES + 8_192 }).map((n) => `[${'1,'.repeat(n / 2)}1]`),
);

export const contentType = fc.oneof(
  fc.constantFrom(
    'application/json', 'application/json; charset=utf-8', 'application/problem+json', 'APPLICATION/JSON', 'application/merge-patch+json',
    'text/plain', 'application/x-www-form-urlencoded', 'multipart/form-data; boundary=x', 'application/xml', 'application/jsonp', 'json', '', ';;;', 'application/json; charset=utf-16',
  ),
  fc.string({ unit: fc.constantFrom(...'abcdefghijklmnopqrstuvwxyz/+;=- '.split('')), maxLength: 40 }),
);

/** Characters a real server lets through in a header value (ISO-8859-1 minus controls). */
const headerChar = fc.oneof(fc.integer({ min: 0x20, max: 0x7e }), fc.integer({ min: 0xa0, max: 0xff })).map((c) => String.fromCharCode(c));
export const headerValue = fc.oneof(
  fc.string({ unit: headerChar, maxLength: 200 }),
  fc.tuple(fc.constantFrom('A', 'é', '"', ','), fc.integer({ min: 4_000, max: 32_000 })).map(([u, n]) => u.repeat(n)),
  fc.constantFrom('W/"review"', '"submitted"', '*', '"', 'W/', '""', 'W/"', '"review', 'review"', '"dispatched", "review"', 'null'),
);

export const headerName = fc.oneof(
  fc.constantFrom('if-match', 'if-none-match', 'origin', 'referer', 'cookie', 'authorization', 'x-forwarded-for', 'x-real-ip', 'content-length', 'accept', 'accept-language', 'x-forwarded-host', 'host', 'user-agent', 'x-http-method-override'),
  fc.string({ unit: fc.constantFrom(...'abcdefghijklmnopqrstuvwxyz0123456789-_'.split('')), minLength: 1, maxLength: 30 }),
);

/** Cookie headers that name no live session: garbage, forged tokens, oversize. */
export function garbageCookie(realCookie: string): fc.Arbitrary<string> {
  const [name] = realCookie.split('=');
  const token = realCookie.slice(name.length + 1).split(';')[0];
  return fc.oneof(
    headerValue,
    fc.string({ unit: headerChar }).map((v) => `${name}=${v}`),
    // The right shape with the signature cut or altered: a forged session.
    fc.integer({ min: 0, max: Math.max(0, token.length - 1) }).map((cut) => `${name}=${token.slice(0, cut)}`),
    // Only inside the token before its signature: a changed padding bit of base64 could decode to the same signature.
    fc.integer({ min: 0, max: Math.max(0, token.indexOf('.') - 1) }).map((at) => `${name}=${token.slice(0, at)}${token[at] === 'A' ? 'B' : 'A'}${token.slice(at + 1)}`),
    fc.uuid().map((id) => `${name}=${id}.${'A'.repeat(43)}=`),
    fc.integer({ min: 2, max: 60 }).map((n) => Array.from({ length: n }, (_, i) => `${name}=${i}`).join('; ')),
  );
}

/** Query strings as key/value pairs: the target's names, unknown names, repeats, huge values. */
export function queryPairs(knownNames: readonly string[]): fc.Arbitrary<[string, string][]> {
  const key = fc.oneof(
    { weight: 3, arbitrary: knownNames.length ? fc.constantFrom(...knownNames) : fc.string() },
    { weight: 1, arbitrary: fc.string() },
    { weight: 1, arbitrary: protoKey },
  );
  return fc.array(fc.tuple(key, nastyString), { maxLength: 8 });
}

/** A value for a path segment: not an id, an id of nothing, a real id, or something worse. */
export function pathParam(realIds: readonly string[], extra: readonly string[] = []): fc.Arbitrary<string> {
  return fc.oneof(
    // A path arrives percent-decoded from UTF-8, so it never holds a lone surrogate.
    { weight: 3, arbitrary: nastyString.filter((s) => s.length > 0 && s.length < 5_000 && !LONE_SURROGATE.test(s)) },
    { weight: 3, arbitrary: fc.uuid({ version: [1, 4, 7] }) },
    { weight: 3, arbitrary: realIds.length ? fc.constantFrom(...realIds) : fc.uuid() },
    { weight: extra.length ? 3 : 0, arbitrary: extra.length ? fc.constantFrom(...extra) : fc.constant('x') },
    { weight: 1, arbitrary: fc.constantFrom('..', '.', '%2e%2e', 'a/b', '\u0000', ' ', 'undefined', 'null') },
  );
}

/**
 * What a client component can hand a server action: React serialises dates, maps, sets, bigints,
 * typed arrays and undefined as well as JSON. Near misses of the action's own fields come first.
 */
export function structuredValue(fieldNames: readonly string[], realIds: readonly string[]): fc.Arbitrary<unknown> {
  const leaf = fc.oneof(
    { weight: 4, arbitrary: nastyJson },
    { weight: 2, arbitrary: realIds.length ? fc.constantFrom(...realIds) : fc.uuid() },
    { weight: 1, arbitrary: fc.uuid() },
    { weight: 1, arbitrary: fc.oneof(fc.date({ noInvalidDate: false }), fc.bigInt(), trickyNumber, fc.constant(undefined)) },
    { weight: 1, arbitrary: fc.array(fc.oneof(trickyNumber, trickyNumberText, fc.dictionary(fc.constantFrom('value', 'flag'), fc.oneof(trickyNumber, nastyString))), { maxLength: 25 }) },
  );
  return fc.oneof(
    { weight: 6, arbitrary: nearMissObject(fieldNames, leaf) },
    { weight: 2, arbitrary: fc.anything({ withBigInt: true, withDate: true, withMap: true, withSet: true, withTypedArray: true, withSparseArray: true, maxDepth: 3 }) },
    { weight: 1, arbitrary: deepValue },
    { weight: 1, arbitrary: fc.constantFrom(null, undefined, '', 0, [], 'values') },
  );
}
