/**
 * Atomic writes: `.gz` targets are gzip (RFC 1952) and read back to the same
 * bytes; a replaced file keeps its permission bits and a symbolic link stays
 * a link (POSIX rename(2) replaces the directory entry, so both need care);
 * SIGINT / SIGTERM / SIGHUP and process.exit during a write remove the
 * temporary file and leave the target's old content (POSIX signal default
 * actions: the process still ends by the signal). Temp-file hygiene is
 * common practice for atomic writers.
 */
import { describe, expect, it, afterAll } from 'vitest';
import { chmodSync, lstatSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, readlinkSync, rmSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { gunzipSync, gzipSync } from 'node:zlib';
import { writeFileAtomic, writeFileAtomicSync, pendingTempFiles } from '../../src/io/atomic.js';
import { OrthodromeError } from '../../src/errors.js';

const dir = mkdtempSync(join(tmpdir(), 'orthodrome-atomic-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const atomicTs = resolve(__dirname, '../../src/io/atomic.ts');

describe('writeFileAtomic', () => {
  it('.gz targets (any case) are gzip-compressed and read back to the data; other names are not', async () => {
    const text = 'vertex,x,y,z,distance\n' + Array.from({ length: 500 }, (_, i) => `${i},${i / 7},0,1,${Math.sqrt(i)}`).join('\n') + '\n';
    await writeFileAtomic(join(dir, 'a.csv.gz'), text);
    writeFileAtomicSync(join(dir, 'b.JSON.GZ'), [text.slice(0, 100), Buffer.from(text.slice(100))]);
    await writeFileAtomic(join(dir, 'c.csv.gz'), (async function* () { yield text.slice(0, 7); yield text.slice(7); })());
    for (const f of ['a.csv.gz', 'b.JSON.GZ', 'c.csv.gz']) {
      const raw = readFileSync(join(dir, f));
      expect([raw[0], raw[1]]).toEqual([0x1f, 0x8b]); // RFC 1952 magic
      expect(gunzipSync(raw).toString('utf8')).toBe(text);
    }
    await writeFileAtomic(join(dir, 'plain.csv'), text);
    expect(readFileSync(join(dir, 'plain.csv'), 'utf8')).toBe(text);
  });

  it('data that is gzip already is not compressed twice; gzip: false writes as given', async () => {
    const gz = gzipSync('hello\n');
    await writeFileAtomic(join(dir, 'd.txt.gz'), gz);
    expect(gunzipSync(readFileSync(join(dir, 'd.txt.gz'))).toString()).toBe('hello\n');
    await writeFileAtomic(join(dir, 'e.gz'), 'raw', { gzip: false });
    expect(readFileSync(join(dir, 'e.gz'), 'utf8')).toBe('raw');
  });

  it('a replaced file keeps its mode (async and sync)', async () => {
    for (const [mode, sync] of [[0o600, false], [0o751, true], [0o640, false]] as const) {
      const p = join(dir, `mode-${mode.toString(8)}.json`);
      writeFileSync(p, 'old');
      chmodSync(p, mode);
      if (sync) writeFileAtomicSync(p, 'new');
      else await writeFileAtomic(p, 'new');
      expect(readFileSync(p, 'utf8')).toBe('new');
      expect(statSync(p).mode & 0o7777).toBe(mode);
    }
  });

  it('a symbolic link target stays a link; the file it points to gets the content', async () => {
    const real = join(dir, 'real.csv'), link = join(dir, 'link.csv');
    writeFileSync(real, 'old');
    symlinkSync('real.csv', link);
    await writeFileAtomic(link, 'via link');
    expect(lstatSync(link).isSymbolicLink()).toBe(true);
    expect(readlinkSync(link)).toBe('real.csv');
    expect(readFileSync(real, 'utf8')).toBe('via link');
  });

  it('a failed write leaves no temporary file and names the target', async () => {
    const sub = join(dir, 'sub');
    mkdirSync(sub);
    const target = join(sub, 'missing-folder', 'x.csv');
    await expect(writeFileAtomic(target, 'x')).rejects.toThrow(OrthodromeError);
    await expect(writeFileAtomic(target, 'x')).rejects.toThrow(new RegExp(`^${target.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}: cannot write file`));
    // A folder as target: the rename fails after the temp file was written.
    mkdirSync(join(sub, 'folder.csv'));
    await expect(writeFileAtomic(join(sub, 'folder.csv'), 'x')).rejects.toThrow(/cannot write file/);
    expect(() => writeFileAtomicSync(join(sub, 'folder.csv'), 'x')).toThrow(/cannot write file/);
    expect(readdirSync(sub)).toEqual(['folder.csv']);
    expect(pendingTempFiles()).toBe(0);
  });
});

/**
 * Runs a child that starts writing `target` (which holds "old"), then ends
 * itself mid-write with `how`, and returns how it ended and the folder's files.
 */
function interrupted(how: 'SIGINT' | 'SIGTERM' | 'SIGHUP' | 'exit') {
  const sub = mkdtempSync(join(dir, 'sig-'));
  const target = join(sub, 'out.csv');
  writeFileSync(target, 'old');
  const stop = how === 'exit' ? 'process.exit(7)' : `process.kill(process.pid, '${how}')`;
  // The chunks come from a generator that pauses after the first one, so the
  // temporary file certainly exists, partly written, when the signal arrives.
  const code = `
    import { writeFileAtomic } from ${JSON.stringify(atomicTs)};
    async function* chunks() {
      yield 'partial,';
      ${stop};
      await new Promise((r) => setTimeout(r, 20000));
      yield 'never';
    }
    await writeFileAtomic(${JSON.stringify(target)}, chunks());
  `;
  const r = spawnSync(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', code], { encoding: 'utf8', timeout: 60_000 });
  return { status: r.status, signal: r.signal, stderr: r.stderr, files: readdirSync(sub), content: readFileSync(target, 'utf8') };
}

describe('signals and exit during a write', () => {
  it.each(['SIGINT', 'SIGTERM', 'SIGHUP'] as const)('%s: no temporary file, old content kept, process ends by the signal', (sig) => {
    const r = interrupted(sig);
    expect(r.signal).toBe(sig);
    expect(r.files).toEqual(['out.csv']);
    expect(r.content).toBe('old');
  });

  it('process.exit mid-write: no temporary file, old content kept', () => {
    const r = interrupted('exit');
    expect(r.status).toBe(7);
    expect(r.files).toEqual(['out.csv']);
    expect(r.content).toBe('old');
  });
});
