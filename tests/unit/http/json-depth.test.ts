import { describe, expect, it } from 'vitest';
import { jsonNestingDepth, tooDeepJson } from '@/lib/http/json-depth';

describe('jsonNestingDepth', () => {
  it('counts arrays and objects, not brackets inside strings', () => {
    expect(jsonNestingDepth('{"files":[{"name":"a.pdf"}]}')).toBe(3);
    expect(jsonNestingDepth('"[[[[{{{{"')).toBe(0);
    expect(jsonNestingDepth('{"a":"\\"[[[["}')).toBe(1);
    expect(jsonNestingDepth('[]'.repeat(3))).toBe(1);
  });
});

describe('tooDeepJson', () => {
  const post = (body: string) => new Request('http://localhost/x', { method: 'POST', body });

  // The upload SDK answered a body like this with a 500.
  it('refuses a body nested deeper than the limit, and leaves it readable for the handler', async () => {
    const request = post(`${'['.repeat(2_000)}${']'.repeat(2_000)}`);
    expect((await tooDeepJson(request))?.code).toBe('invalid');
    expect((await request.text()).length).toBe(4_000);
  });

  it('lets an ordinary upload request through', async () => {
    expect(await tooDeepJson(post(JSON.stringify({ files: [{ name: 'a.pdf', size: 1, type: 'application/pdf' }], input: { caseId: 'x', kind: 'photo' } })))).toBeNull();
  });
});
