import { describe, expect, it } from 'vitest';
import { ApiCallError } from '../../src-renderer/client/client.ts';
import { createHttpTransport, createHttpUploader, WRONG_KEY_MESSAGE } from '../../src-renderer/client/http-transport.ts';

const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });

describe('createHttpUploader', () => {
  it('posts the file itself as the body, with the token and the encoded name, and answers the upload id', async () => {
    const seen: { url: string; init: RequestInit }[] = [];
    const fetchImpl = (async (url: string, init: RequestInit) => {
      seen.push({ url, init });
      return json(200, { ok: true, value: { upload: 'c'.repeat(32), bytes: 5 } });
    }) as unknown as typeof fetch;
    const file = new File(['a,b\n'], 'Week 49 – clicks.csv');
    expect(await createHttpUploader('tok', fetchImpl)(file)).toEqual({ upload: 'c'.repeat(32), bytes: 5 });
    expect(seen[0]!.url).toBe('/upload');
    expect(seen[0]!.init.body).toBe(file); // streamed by the browser, not read into a string first
    expect(seen[0]!.init.headers).toMatchObject({
      'content-type': 'application/octet-stream',
      'x-file-name': encodeURIComponent('Week 49 – clicks.csv'),
      'x-shelfwright-token': 'tok',
    });
  });

  it("turns the shell's refusal into an ApiCallError with its message", async () => {
    const fetchImpl = (async () => json(413, { ok: false, error: { code: 'input', message: 'the file is larger than 4 GiB' } })) as unknown as typeof fetch;
    const e = await createHttpUploader('tok', fetchImpl)(new File(['x'], 'x.csv')).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(ApiCallError);
    expect((e as ApiCallError).message).toBe('the file is larger than 4 GiB');
  });

  it('says what to do when the shell does not know the key (401), for calls and uploads alike', async () => {
    const fetchImpl = (async () => json(401, { ok: false, error: { code: 'input', message: 'missing or wrong launch token' } })) as unknown as typeof fetch;
    expect(await createHttpTransport('stale', fetchImpl)('workspace.info', {})).toEqual({ ok: false, error: { code: 'input', message: WRONG_KEY_MESSAGE } });
    const e = await createHttpUploader('stale', fetchImpl)(new File(['x'], 'x.csv')).catch((x: unknown) => x);
    expect((e as ApiCallError).message).toMatch(/^Shelfwright does not recognise this window/);
  });
});
