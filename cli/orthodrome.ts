#!/usr/bin/env node
/**
 * The `orthodrome` command line: parses arguments and calls the library.
 * Each command lives in cli/commands/ and stays thin.
 */
import { Command, CommanderError } from 'commander';
import { registerInspect } from './commands/inspect.js';
import { registerCurvature } from './commands/curvature.js';
import { registerDemo } from './commands/demo.js';
import { registerDistance } from './commands/distance.js';
import { registerPath } from './commands/path.js';
import { registerIsolines } from './commands/isolines.js';
import { registerOffset } from './commands/offset.js';
import { registerStraight } from './commands/straight.js';
import { registerScore } from './commands/score.js';
import { registerTravel } from './commands/travel.js';
import { EXIT_INPUT, reportError } from './run.js';

const program = new Command();
program
  .name('orthodrome')
  .description('Intrinsic distances, shortest paths and curvature on triangulated surfaces (OBJ, PLY).')
  .version('0.1.0')
  .showHelpAfterError('(run with --help for usage)')
  .exitOverride()
  .configureOutput({
    outputError: (str, write) => write(`orthodrome: ${str.replace(/^error: /, '')}`),
  });

registerInspect(program);
registerCurvature(program);
registerDistance(program);
registerPath(program);
registerIsolines(program);
registerOffset(program);
registerStraight(program);
registerScore(program);
registerTravel(program);
registerDemo(program);

try {
  await program.parseAsync(process.argv);
} catch (e) {
  if (e instanceof CommanderError) {
    process.exitCode = e.exitCode === 0 || e.code === 'commander.helpDisplayed' || e.code === 'commander.version' ? 0 : EXIT_INPUT;
  } else {
    process.exitCode = reportError(e);
  }
}
