// Hostile inputs generated from a route's zod schema, for the bad-input
// property test. Each value is mostly of the schema's shape (so the input gets
// past the outer checks and reaches the service) with hostile leaves: control
// characters, NUL, dates at the ends of the calendar, numbers past every
// column, wrong types, unknown keys, missing keys.
import fc from 'fast-check';
import { z, type ZodTypeAny } from 'zod';

const HOSTILE_STRINGS = [
  'Probe\u0000Tester',
  '\u0000',
  'a\u0007b\u001B[2J',
  'line\r\nbreak',
  '\u0085\u009F',
  '0000-01-01',
  '9999-12-31',
  '2026-02-30',
  '9999-12-31T23:59:59Z',
  '0000-01-01T00:00:00Z',
  '+275760-09-13T00:00:00Z',
  '=HYPERLINK("a")',
  "' OR 1=1 --",
  '"; DROP TABLE assets; --',
  '../../etc/passwd',
  '%00',
  '\\u0000',
  '\uD800',
  '😀'.repeat(50),
  ' ',
  '',
  '-1',
  '0',
  '99999999999999999999',
  '1e309',
  'NaN',
  'null',
  'true',
  '[]',
  '{}',
  'x'.repeat(5000),
];

const HOSTILE_NUMBERS = [0, -1, 1, 2_147_483_647, 2_147_483_648, -2_147_483_649, 1e308, -1e308, 0.5, Number.MAX_SAFE_INTEGER + 2, 1e21];

export const junk: fc.Arbitrary<unknown> = fc.oneof(
  fc.constant(null),
  fc.boolean(),
  fc.constantFrom(...HOSTILE_STRINGS),
  fc.constantFrom(...HOSTILE_NUMBERS),
  fc.array(fc.constantFrom(...HOSTILE_STRINGS), { maxLength: 3 }),
  fc.dictionary(fc.constantFrom('a', '__proto__', 'constructor', '\u0000'), fc.constantFrom(...HOSTILE_STRINGS), { maxKeys: 2 }),
);

function stringOf(schema: z.ZodString): fc.Arbitrary<string> {
  const checks = schema._def.checks;
  const max = checks.find((c) => c.kind === 'max')?.value as number | undefined;
  const min = checks.find((c) => c.kind === 'min')?.value as number | undefined;
  const options: fc.Arbitrary<string>[] = [fc.string({ minLength: Math.min(min ?? 0, 20), maxLength: Math.min(max ?? 40, 60) }), fc.constantFrom(...HOSTILE_STRINGS)];
  if (checks.some((c) => c.kind === 'uuid')) options.push(fc.uuid());
  if (checks.some((c) => c.kind === 'email')) options.push(fc.emailAddress());
  if (checks.some((c) => c.kind === 'datetime')) {
    options.push(fc.date({ min: new Date('0001-01-01T00:00:00Z'), max: new Date('9999-12-31T23:59:59Z'), noInvalidDate: true }).map((d) => d.toISOString()));
  }
  const patterns = checks.filter((c): c is { kind: 'regex'; regex: RegExp; message?: string } => c.kind === 'regex').map((c) => c.regex);
  const specific = patterns.filter((r) => !r.source.includes('\\u0000'));
  if (specific.length) options.push(fc.stringMatching(specific[specific.length - 1]!).map((s) => s.slice(0, 200)));
  // A valid-looking value with one control character slipped in.
  options.push(fc.tuple(fc.string({ maxLength: 10 }), fc.constantFrom('\u0000', '\u0001', '\u001F', '\u007F', '\u0085')).map(([s, c]) => `${s}${c}${s}`));
  return fc.oneof(...options);
}

function numberOf(schema: z.ZodNumber): fc.Arbitrary<number> {
  const checks = schema._def.checks;
  const isInt = checks.some((c) => c.kind === 'int');
  const min = (checks.find((c) => c.kind === 'min')?.value as number | undefined) ?? -1000;
  const max = (checks.find((c) => c.kind === 'max')?.value as number | undefined) ?? 1_000_000;
  const inRange = isInt
    ? fc.integer({ min: Math.max(Math.ceil(min), -2_147_483_648), max: Math.min(Math.floor(max), 2_147_483_647) })
    : fc.double({ min: Math.max(min, -1e9), max: Math.min(max, 1e9), noNaN: true });
  return fc.oneof(inRange, fc.constantFrom(...HOSTILE_NUMBERS));
}

/** Values of the schema's shape with hostile leaves; a wrong-typed value now and then. */
export function arbitraryFor(schema: ZodTypeAny, depth = 0): fc.Arbitrary<unknown> {
  const typed = shaped(schema, depth);
  return depth > 3 ? typed : fc.oneof({ weight: 6, arbitrary: typed }, { weight: 1, arbitrary: junk });
}

function shaped(schema: ZodTypeAny, depth: number): fc.Arbitrary<unknown> {
  const def = schema._def as { typeName: z.ZodFirstPartyTypeKind } & Record<string, any>;
  switch (def.typeName) {
    case z.ZodFirstPartyTypeKind.ZodString:
      return stringOf(schema as z.ZodString);
    case z.ZodFirstPartyTypeKind.ZodNumber:
      return numberOf(schema as z.ZodNumber);
    case z.ZodFirstPartyTypeKind.ZodBigInt:
      return fc.bigInt().map(String);
    case z.ZodFirstPartyTypeKind.ZodBoolean:
      return fc.boolean();
    case z.ZodFirstPartyTypeKind.ZodDate:
      return fc.constantFrom('0000-01-01', '9999-12-31', '2026-12-02');
    case z.ZodFirstPartyTypeKind.ZodLiteral:
      return fc.constant(def.value);
    case z.ZodFirstPartyTypeKind.ZodEnum:
      return fc.oneof({ weight: 4, arbitrary: fc.constantFrom(...(def.values as string[])) }, { weight: 1, arbitrary: fc.constantFrom('\u0000', 'teleport', '') });
    case z.ZodFirstPartyTypeKind.ZodNativeEnum:
      return fc.constantFrom(...Object.values(def.values as object));
    case z.ZodFirstPartyTypeKind.ZodOptional:
    case z.ZodFirstPartyTypeKind.ZodNullable:
      return fc.oneof(fc.constant(undefined), fc.constant(null), arbitraryFor(def.innerType, depth));
    case z.ZodFirstPartyTypeKind.ZodDefault:
    case z.ZodFirstPartyTypeKind.ZodCatch:
      return fc.oneof(fc.constant(undefined), arbitraryFor(def.innerType, depth));
    case z.ZodFirstPartyTypeKind.ZodEffects:
      return arbitraryFor(def.schema, depth);
    case z.ZodFirstPartyTypeKind.ZodPipeline:
      return arbitraryFor(def.in, depth);
    case z.ZodFirstPartyTypeKind.ZodBranded:
    case z.ZodFirstPartyTypeKind.ZodReadonly:
      return arbitraryFor(def.type ?? def.innerType, depth);
    case z.ZodFirstPartyTypeKind.ZodLazy:
      return depth > 3 ? junk : arbitraryFor(def.getter(), depth + 1);
    case z.ZodFirstPartyTypeKind.ZodArray:
      return fc.array(arbitraryFor(def.type, depth + 1), { maxLength: 4 });
    case z.ZodFirstPartyTypeKind.ZodTuple:
      return fc.tuple(...(def.items as ZodTypeAny[]).map((i) => arbitraryFor(i, depth + 1)));
    case z.ZodFirstPartyTypeKind.ZodRecord:
      return fc.dictionary(stringOf(def.keyType instanceof z.ZodString ? def.keyType : z.string()), arbitraryFor(def.valueType, depth + 1), { maxKeys: 3 });
    case z.ZodFirstPartyTypeKind.ZodUnion:
    case z.ZodFirstPartyTypeKind.ZodDiscriminatedUnion: {
      const options = (def.options instanceof Map ? [...def.options.values()] : def.options) as ZodTypeAny[];
      return fc.oneof(...options.map((o) => arbitraryFor(o, depth + 1)));
    }
    case z.ZodFirstPartyTypeKind.ZodIntersection:
      return fc
        .tuple(arbitraryFor(def.left, depth + 1), arbitraryFor(def.right, depth + 1))
        .map(([a, b]) => (a && b && typeof a === 'object' && typeof b === 'object' ? { ...a, ...b } : a));
    case z.ZodFirstPartyTypeKind.ZodObject: {
      const shape = (schema as z.AnyZodObject).shape as Record<string, ZodTypeAny>;
      const entries = Object.entries(shape).map(([k, v]) => [k, arbitraryFor(v, depth + 1)] as const);
      return fc
        .tuple(fc.record(Object.fromEntries(entries)), fc.subarray(Object.keys(shape)), fc.option(fc.constantFrom('unexpected', '__proto__', 'constructor'), { nil: undefined }))
        .map(([value, drop, extra]) => {
          const out: Record<string, unknown> = { ...(value as object) };
          // now and then a required key is missing, or an unknown key is added
          if (drop.length === 1) delete out[drop[0]!];
          if (extra) out[extra] = 'x';
          for (const k of Object.keys(out)) if (out[k] === undefined) delete out[k];
          return out;
        });
    }
    default:
      return junk;
  }
}

/** Query-string values: every leaf as the text a URL would carry. */
export function queryArbitraryFor(schema: ZodTypeAny): fc.Arbitrary<Record<string, string>> {
  return arbitraryFor(schema).map((v) => {
    const out: Record<string, string> = {};
    if (!v || typeof v !== 'object' || Array.isArray(v)) return { junk: String(v) };
    for (const [k, x] of Object.entries(v)) {
      if (x === undefined) continue;
      out[k] = typeof x === 'string' ? x : (JSON.stringify(x) ?? '');
    }
    return out;
  });
}
