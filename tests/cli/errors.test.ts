import { describe, expect, it } from 'vitest';
import { runCli } from '../support/cli-run.js';

const KEY = `tw_server_abcdefghijkl_${'C'.repeat(32)}`;
const args = ['calc', 'reels', '850', '--api-url', 'http://api.treadwise.test', '--api-key', KEY];

/** A fetch that answers every request with this response, as a misbehaving or limiting server would. */
const answering = (make: () => Response): typeof fetch => async () => make();

describe('errors from the API', () => {
  it('prints a 429 as one line with the wait, the code and the request id', async () => {
    const problem = { type: 'about:blank', title: 'Too many requests', status: 429, detail: 'The key’s rate limit is reached.', code: 'rate_limited', requestId: '0f8e2c1a-7b3d-4e5f-9a6b-1c2d3e4f5a6b' };
    const run = await runCli(args, {
      fetch: answering(() => new Response(JSON.stringify(problem), { status: 429, headers: { 'content-type': 'application/problem+json', 'retry-after': '30' } })),
    });
    expect(run.code).toBe(1);
    expect(run.stderr).toBe('treadwise: Too many requests: The key’s rate limit is reached. retry after 30 s (code rate_limited, request 0f8e2c1a-7b3d-4e5f-9a6b-1c2d3e4f5a6b)\n');
  });

  it('names the status and the X-Request-Id when the answer is not a problem document', async () => {
    const run = await runCli(args, {
      fetch: answering(() => new Response('<html>gateway</html>', { status: 502, statusText: 'Bad Gateway', headers: { 'content-type': 'text/html', 'x-request-id': 'edge-42' } })),
    });
    expect(run.code).toBe(1);
    expect(run.stderr).toBe('treadwise: HTTP 502 Bad Gateway (request edge-42)\n');
  });

  it('turns a failure inside a command into one line, never a stack trace', async () => {
    const run = await runCli(args, { fetch: answering(() => new Response('{"reels": "not an answer"}', { status: 200, headers: { 'content-type': 'application/json' } })) });
    expect(run.code).toBe(1);
    expect(run.stderr.split('\n').filter(Boolean)).toHaveLength(1);
    expect(run.stderr).toMatch(/^treadwise: /);
    expect(run.stderr).not.toMatch(/\bat \S+:\d+/);
  });
});
