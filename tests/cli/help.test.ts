import type { Command } from 'commander';
import { describe, expect, it } from 'vitest';
import { processIo } from '../../cli/io.js';
import { createProgram } from '../../cli/program.js';
import { runCli } from '../support/cli-run.js';

/** Every command path of the program, e.g. ['keys', 'rotate']. */
function commandPaths(command: Command, prefix: string[] = []): { path: string[]; leaf: boolean; command: Command }[] {
  return command.commands.flatMap((sub) => {
    const path = [...prefix, sub.name()];
    return [{ path, leaf: sub.commands.length === 0, command: sub }, ...commandPaths(sub, path)];
  });
}

const paths = commandPaths(createProgram(processIo));

describe('treadwise conventions', () => {
  it('has the fixed command names', () => {
    expect(paths.map((p) => p.path.join(' ')).sort()).toEqual(
      [
        'batch', 'calc', 'calc cable', 'calc driver', 'calc pixels', 'calc reels', 'calc voltage-drop',
        'catalog', 'catalog export', 'catalog import', 'estimate', 'health',
        'keys', 'keys create', 'keys list', 'keys revoke', 'keys rotate',
        'login', 'logout', 'projects', 'projects export', 'projects list', 'projects show', 'usage', 'whoami',
      ].sort(),
    );
  });

  it.each(paths.map((p) => [p.path.join(' '), p] as const))('%s: --help shows an example of itself', async (_name, p) => {
    const run = await runCli([...p.path, '--help']);
    expect(run.code).toBe(0);
    expect(run.stdout).toContain(`Examples:\n  $ treadwise ${p.path.join(' ')}`);
  });

  it('offers --json on every command that answers', () => {
    for (const p of paths.filter((x) => x.leaf)) expect(p.command.options.map((o) => o.long), p.path.join(' ')).toContain('--json');
  });

  it('exits 2 on usage errors: unknown command, unknown option, missing argument, a group without its subcommand', async () => {
    for (const args of [['frobnicate'], ['whoami', '--frob'], ['keys', 'revoke'], ['keys']]) {
      const run = await runCli(args);
      expect(run.code, args.join(' ')).toBe(2);
      expect(run.stderr, args.join(' ')).not.toMatch(/\bat \S+:\d+/);
    }
  });
});
