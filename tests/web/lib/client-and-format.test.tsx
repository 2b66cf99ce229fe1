import { afterEach, describe, expect, it, vi } from 'vitest';
import * as z from 'zod';
import { ApiError, apiFetch, withQuery } from '@/lib/api-client';
import { formatAngstrom, percent, splitGroup, spokenGroup } from '@/lib/format';
import { normaliseGroup, schoenfliesPattern } from '@/lib/snap-settings-form';
import { perFileProgress } from '@/lib/upload';

afterEach(() => vi.unstubAllGlobals());

function respond(body: unknown, status = 200) {
  const fetchMock = vi.fn(async () => new Response(typeof body === 'string' ? body : JSON.stringify(body), { status }));
  vi.stubGlobal('fetch', fetchMock);
  return fetchMock;
}

describe('apiFetch', () => {
  it('sends JSON with the session cookie and parses the answer with the schema', async () => {
    const fetchMock = respond({ id: 'x', extra: 1 });
    const data = await apiFetch('/api/thing', { method: 'POST', body: { a: 1 }, schema: z.object({ id: z.string() }) });
    expect(data).toEqual({ id: 'x' });
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe('/api/thing');
    expect(init.credentials).toBe('same-origin');
    expect(init.body).toBe('{"a":1}');
    expect((init.headers as Record<string, string>)['Content-Type']).toBe('application/json');
  });

  it('turns the API error body into an ApiError with status, code and message', async () => {
    respond({ error: { code: 'conflict', message: 'A workspace needs at least one owner' } }, 409);
    const error = await apiFetch('/api/x', { schema: z.object({}) }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 409, code: 'conflict', message: 'A workspace needs at least one owner' });
  });

  it('reports a response that breaks the contract instead of passing it on', async () => {
    respond({ id: 42 });
    const error = await apiFetch('/api/x', { schema: z.object({ id: z.string() }) }).catch((e: unknown) => e);
    expect(error).toMatchObject({ code: 'contract' });
    expect((error as Error).message).toContain('id');
  });

  it('reports a network failure as status 0', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => Promise.reject(new TypeError('Failed to fetch'))));
    await expect(apiFetch('/api/x')).rejects.toMatchObject({ status: 0, code: 'network' });
  });

  it('drops empty query values so URLs and query keys agree', () => {
    expect(withQuery('/a', { q: '', status: undefined, page: 2, x: null })).toBe('/a?page=2');
    expect(withQuery('/a', { q: 'C2v & D3h' })).toBe('/a?q=C2v+%26+D3h');
  });
});

describe('formatting', () => {
  it('splits Schoenflies symbols into letter and subscript', () => {
    expect(splitGroup('C2v')).toEqual({ letter: 'C', subscript: '2v' });
    expect(splitGroup('D∞h')).toEqual({ letter: 'D', subscript: '∞h' });
    expect(splitGroup('O')).toEqual({ letter: 'O', subscript: '' });
    expect(spokenGroup('D∞h')).toBe('D infinity h');
  });

  it('writes lengths in Å, tiny residuals in scientific notation', () => {
    expect(formatAngstrom(0.01234)).toBe('0.0123\u00a0Å');
    expect(formatAngstrom(3e-12)).toBe('3.0e-12\u00a0Å');
    expect(formatAngstrom(null)).toBe('—');
  });

  it('rounds progress down so 100 % means finished', () => {
    expect(percent(39, 40)).toBe(97);
    expect(percent(40, 40)).toBe(100);
    expect(percent(0, 0)).toBe(0);
  });
});

describe('named target groups', () => {
  // Group list: the finite point groups and the two linear groups (DESIGN.md, "Perceive").
  it.each(['C1', 'Cs', 'Ci', 'C2', 'C3v', 'C2h', 'D2', 'D3d', 'D6h', 'S4', 'T', 'Td', 'Th', 'O', 'Oh', 'I', 'Ih', 'C∞v', 'D∞h'])('accepts %s', (g) => {
    expect(schoenfliesPattern.test(g)).toBe(true);
  });
  it.each(['C2x', 'Dd', 'Q2', 'Tv', '', 'c2v'])('refuses %s as typed', (g) => {
    expect(schoenfliesPattern.test(g)).toBe(false);
  });
  it('normalises what people type', () => {
    expect(normaliseGroup(' c2V ')).toBe('C2v');
    expect(normaliseGroup('Dinfh')).toBe('D∞h');
  });
});

describe('per-file upload progress', () => {
  it('splits the bytes sent over the files in order', () => {
    // two files of 100 and 300 bytes; body 420 bytes with multipart framing
    expect(perFileProgress([100, 300], 0, 420)).toEqual([0, 0]);
    expect(perFileProgress([100, 300], 210, 420)).toEqual([1, 1 / 3]);
    expect(perFileProgress([100, 300], 420, 420)).toEqual([1, 1]);
  });
});
