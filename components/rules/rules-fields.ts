import { z } from 'zod';
import { schemeRulesSchema, type SchemeRules } from '@/lib/rules/schema';

/** Every leaf of a nested object type as a dotted path: "limits.upper", "money.feeBorneBy". */
export type LeafPath<T, Prefix extends string = ''> = {
  [K in keyof T & string]-?: NonNullable<T[K]> extends readonly unknown[]
    ? `${Prefix}${K}`
    : NonNullable<T[K]> extends object
      ? LeafPath<NonNullable<T[K]>, `${Prefix}${K}.`>
      : `${Prefix}${K}`;
}[keyof T & string];

export type RulesPath = LeafPath<SchemeRules>;

export type RulesLeaf = {
  path: RulesPath;
  section: keyof SchemeRules;
  kind: 'number' | 'enum' | 'boolean' | 'string';
  optional: boolean;
  options: readonly string[];
  min: number | null;
  max: number | null;
  integer: boolean;
};

/**
 * The fields of the scheme's rules as the rules' own schema defines them, in its order. The editor
 * draws one control per leaf from this, so a field added to the schema appears in the form (and the
 * explanation it needs is demanded by the type of the explanations).
 */
export function rulesLeaves(schema: z.ZodObject = schemeRulesSchema as unknown as z.ZodObject): RulesLeaf[] {
  const out: RulesLeaf[] = [];
  const walk = (node: z.ZodType, path: string[], optional: boolean) => {
    if (node instanceof z.ZodOptional) return walk(node.unwrap() as z.ZodType, path, true);
    if (node instanceof z.ZodObject) {
      for (const [key, child] of Object.entries(node.shape)) walk(child as z.ZodType, [...path, key], optional);
      return;
    }
    const base = { path: path.join('.') as RulesPath, section: path[0] as keyof SchemeRules, optional, options: [] as readonly string[], min: null, max: null, integer: false };
    if (node instanceof z.ZodNumber) {
      out.push({ ...base, kind: 'number', min: Number.isFinite(node.minValue) ? node.minValue : null, max: Number.isFinite(node.maxValue) ? node.maxValue : null, integer: node.isInt });
    } else if (node instanceof z.ZodEnum) {
      out.push({ ...base, kind: 'enum', options: node.options as readonly string[] });
    } else if (node instanceof z.ZodBoolean) {
      out.push({ ...base, kind: 'boolean' });
    } else if (node instanceof z.ZodString) {
      out.push({ ...base, kind: 'string' });
    } else {
      throw new Error(`The rules editor has no control for the field ${path.join('.')}`);
    }
  };
  walk(schema, [], false);
  return out;
}

/** The value at a dotted path of a rules document. */
export function valueAt(rules: unknown, path: string): unknown {
  let node: unknown = rules;
  for (const key of path.split('.')) {
    if (!node || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  return node;
}

/** The leaves whose values differ between two rules documents: what a new version changes. */
export function changedLeaves(before: unknown, after: unknown, leaves: RulesLeaf[] = rulesLeaves()): { path: RulesPath; before: unknown; after: unknown }[] {
  return leaves
    .map((leaf) => ({ path: leaf.path, before: valueAt(before, leaf.path), after: valueAt(after, leaf.path) }))
    .filter((c) => !(c.before === c.after || (typeof c.before === 'number' && typeof c.after === 'number' && Math.abs(c.before - c.after) < 1e-12)));
}
