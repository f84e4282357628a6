/**
 * Finds and launches the headless Chromium that the browser tests drive
 * through playwright-core. In order of preference:
 *
 * 1. `CHROMIUM_PATH`, when set (it must exist: a wrong path is an error, not
 *    a reason to look elsewhere);
 * 2. a system `chromium` on the PATH (Debian's package installs /usr/bin/chromium);
 * 3. the Chromium shipped by the dev dependency `@sparticuz/chromium`, WebGL 2
 *    through SwiftShader. Its package asks for Node 22, but it launches on
 *    Node 20 (npm only warns about the engine). On first use it is unpacked
 *    (about 1.5 s) into a private folder that is then renamed to
 *    `<tmp>/orthodrome-chromium-<version>`, so a run never sees another run's
 *    half-unpacked browser, nor another project's /tmp/chromium.
 *
 * Failing to launch is an error, never a skip: a fresh machine with only Node
 * and npm must run the browser test.
 */
import { accessSync, constants, existsSync, mkdtempSync, readFileSync, renameSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { delimiter, dirname, join } from 'node:path';
import { chromium as playwright, type Browser } from 'playwright-core';

/** Where the browser came from, for messages. */
export type BrowserSource = 'CHROMIUM_PATH' | 'system' | '@sparticuz/chromium';

/** A launched browser and the executable it runs. */
export interface LaunchedBrowser {
  readonly browser: Browser;
  readonly executable: string;
  readonly source: BrowserSource;
}

/** Flags for a desktop Chromium run headless in a sandbox-less container, with no network chatter. */
const SYSTEM_ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic'];

function isExecutable(file: string): boolean {
  try {
    accessSync(file, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

/** The first `chromium` on the PATH, or null. */
function systemChromium(): string | null {
  for (const dir of (process.env.PATH ?? '').split(delimiter)) {
    if (!dir) continue;
    const file = join(dir, 'chromium');
    if (isExecutable(file)) return file;
  }
  return null;
}

/** Launches a headless Chromium (see the file header for the order); throws with the reason when none starts. */
export async function launchChromium(): Promise<LaunchedBrowser> {
  const override = process.env.CHROMIUM_PATH;
  if (override) {
    if (!existsSync(override)) throw new Error(`CHROMIUM_PATH=${override} does not exist`);
    const browser = await playwright.launch({ executablePath: override, args: SYSTEM_ARGS, headless: true });
    return { browser, executable: override, source: 'CHROMIUM_PATH' };
  }
  const system = systemChromium();
  if (system) {
    const browser = await playwright.launch({ executablePath: system, args: SYSTEM_ARGS, headless: true });
    return { browser, executable: system, source: 'system' };
  }
  let packaged: typeof import('@sparticuz/chromium').default;
  try {
    packaged = (await import('@sparticuz/chromium')).default;
  } catch (e) {
    throw new Error(`no Chromium: CHROMIUM_PATH is unset, no 'chromium' on the PATH, and the dev dependency @sparticuz/chromium did not load (run npm ci): ${(e as Error).message}`);
  }
  const executable = await unpackOnce(packaged);
  const browser = await playwright.launch({ executablePath: executable, args: packaged.args, headless: true });
  return { browser, executable, source: '@sparticuz/chromium' };
}

/**
 * The packaged browser's executable, unpacked once per version: the package
 * unpacks into os.tmpdir(), so TMPDIR points at a fresh private folder while
 * it does, and that folder is then renamed into place (atomic; if another run
 * got there first, its copy is used and ours removed).
 */
async function unpackOnce(packaged: typeof import('@sparticuz/chromium').default): Promise<string> {
  const pkgFile = join(dirname(createRequire(import.meta.url).resolve('@sparticuz/chromium')), '..', 'package.json');
  const version = (JSON.parse(readFileSync(pkgFile, 'utf8')) as { version: string }).version;
  const home = join(tmpdir(), `orthodrome-chromium-${version}`);
  const exe = join(home, 'chromium');
  if (isExecutable(exe)) return exe;
  const scratch = mkdtempSync(`${home}.part-`);
  const saved = process.env.TMPDIR;
  process.env.TMPDIR = scratch;
  try {
    await packaged.executablePath();
  } finally {
    if (saved === undefined) delete process.env.TMPDIR;
    else process.env.TMPDIR = saved;
  }
  try {
    renameSync(scratch, home);
  } catch (e) {
    rmSync(scratch, { recursive: true, force: true });
    if (!isExecutable(exe)) throw e;
  }
  return exe;
}
