/** Runs the CLI from source in a child process and captures its output. */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { dirname, resolve } from 'node:path';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');

/** Result of one CLI run. */
export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs `orthodrome ARGS` (from cli/orthodrome.ts through tsx) in `cwd` (default: repo root). */
export function runCli(args: string[], cwd = root): CliResult {
  const r = spawnSync(process.execPath, ['--import', 'tsx', resolve(root, 'cli/orthodrome.ts'), ...args], {
    cwd,
    encoding: 'utf8',
    env: { ...process.env, ORTHODROME_DEBUG: '' },
    timeout: 120_000,
  });
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}

/** Absolute path of a file in the repository. */
export function repoPath(p: string): string {
  return resolve(root, p);
}
