import { AppError } from '@/lib/errors';

/** How deeply JSON text nests, counted without parsing it (so without recursion), strings skipped. */
export function jsonNestingDepth(text: string): number {
  let depth = 0;
  let deepest = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (inString) {
      if (c === '\\') i++;
      else if (c === '"') inString = false;
    } else if (c === '"') inString = true;
    else if (c === '[' || c === '{') deepest = Math.max(deepest, ++depth);
    else if (c === ']' || c === '}') depth--;
  }
  return deepest;
}

/**
 * A library handler that decodes JSON recursively fails with a 500 on absurd nesting. No request of
 * ours nests beyond a handful of levels, so a body deeper than `maxDepth` is refused as a 400 first.
 */
export async function tooDeepJson(request: Request, maxDepth = 32): Promise<AppError | null> {
  // Whatever the declared type: a handler may decode the body as JSON anyway.
  if (!request.body) return null;
  const depth = jsonNestingDepth(await request.clone().text());
  return depth > maxDepth ? new AppError('invalid', `The body nests ${depth} levels deep; at most ${maxDepth} are accepted.`) : null;
}
