#!/usr/bin/env node
/**
 * The `orthodrome` command line: parses arguments and calls the library.
 * Each command lives in cli/commands/ and stays thin; only the one being
 * run is loaded.
 */
import { Command, CommanderError } from 'commander';
import { EXIT_INPUT, reportError } from './run.js';

const program = new Command();
program
  .name('orthodrome')
  .description('Intrinsic distances, shortest paths and curvature on triangulated surfaces (OBJ, PLY, STL).')
  .version('0.1.0')
  .showHelpAfterError('(run with --help for usage)')
  .exitOverride()
  .configureOutput({
    outputError: (str, write) => write(`orthodrome: ${str.replace(/^error: /, '')}`),
  });

/**
 * Each command's module, in the order help lists them. Only the command being run is loaded
 * (every command for help, a typo or no command): a run does not pay for the others' libraries.
 */
type Register = (program: Command) => void;
const COMMANDS: [string, () => Promise<Register>][] = [
  ['inspect', async () => (await import('./commands/inspect.js')).registerInspect],
  ['curvature', async () => (await import('./commands/curvature.js')).registerCurvature],
  ['distance', async () => (await import('./commands/distance.js')).registerDistance],
  ['path', async () => (await import('./commands/path.js')).registerPath],
  ['isolines', async () => (await import('./commands/isolines.js')).registerIsolines],
  ['offset', async () => (await import('./commands/offset.js')).registerOffset],
  ['straight', async () => (await import('./commands/straight.js')).registerStraight],
  ['score', async () => (await import('./commands/score.js')).registerScore],
  ['travel', async () => (await import('./commands/travel.js')).registerTravel],
  ['demo', async () => (await import('./commands/demo.js')).registerDemo],
];
const asked = COMMANDS.filter(([name]) => name === process.argv[2]);
for (const [, load] of asked.length ? asked : COMMANDS) (await load())(program);

try {
  await program.parseAsync(process.argv);
} catch (e) {
  if (e instanceof CommanderError) {
    process.exitCode = e.exitCode === 0 || e.code === 'commander.helpDisplayed' || e.code === 'commander.version' ? 0 : EXIT_INPUT;
  } else {
    process.exitCode = reportError(e);
  }
}
