import { describe, expect, it, vi } from 'vitest';
import { runCli } from '../../cli/program';
import { fakeDeps } from '../helpers/cli';

const answering = (status: number, body: unknown) =>
  vi.fn<typeof fetch>(async () => new Response(JSON.stringify(body), { status }));

describe('vanbay health', () => {
  it('prints the server answer as JSON and exits 0 when healthy', async () => {
    const fetch = answering(200, { ok: true });
    const io = fakeDeps(fetch);
    expect(await runCli(['health', '--json'], io.deps)).toBe(0);
    expect(JSON.parse(io.stdout())).toEqual({ server: 'http://localhost:5180', ok: true });
    expect(String(fetch.mock.calls[0]![0])).toBe('http://localhost:5180/api/health');
  });

  it('uses --server before VANBAY_URL before the default (CONTRACT.md)', async () => {
    const fetch = answering(200, { ok: true });
    const io = fakeDeps(fetch, { VANBAY_URL: 'http://van.local:7000/' });
    await runCli(['health', '--json'], io.deps);
    expect(String(fetch.mock.calls[0]![0])).toBe('http://van.local:7000/api/health');
    await runCli(['--server', 'http://127.0.0.1:6001', 'health', '--json'], io.deps);
    expect(String(fetch.mock.calls[1]![0])).toBe('http://127.0.0.1:6001/api/health');
  });

  it('exits 1 and says why when the server cannot be reached', async () => {
    const io = fakeDeps(vi.fn<typeof fetch>(async () => Promise.reject(new Error('connect ECONNREFUSED'))));
    expect(await runCli(['health'], io.deps)).toBe(1);
    expect(io.stdout()).toMatch(/unreachable/);
    expect(io.stdout()).toMatch(/ECONNREFUSED/);
  });

  it('exits 1 when the server answers but is not healthy', async () => {
    const io = fakeDeps(answering(503, { ok: false }));
    expect(await runCli(['health', '--json'], io.deps)).toBe(1);
    expect(JSON.parse(io.stdout()).ok).toBe(false);
  });

  it('exits 2 with one line on stderr for bad input, and prints nothing on stdout', async () => {
    for (const argv of [['--bogus'], ['health', '--bogus'], ['--server', 'not a url', 'health']]) {
      const io = fakeDeps(answering(200, { ok: true }));
      const code = await runCli(argv, io.deps);
      expect(code).toBe(2);
      expect(io.stdout()).toBe('');
      expect(io.stderr().trim().split('\n')).toHaveLength(1);
    }
  });
});
