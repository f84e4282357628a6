/**
 * The `score` part of `orthodrome demo`: the incoming check of the four
 * invented PX-7 parts in meshes/score-demo/ (manifest with landmark
 * nominals, rules file), one of them from a worn die and made to fail. The
 * run is `orthodrome score` itself (its summary goes to stdout as usual);
 * its exit code 1 (a part failed a gate) is reported in the demo's text,
 * not passed on, so the demo as a whole still ends with 0.
 */
import { join } from 'node:path';
import { runScore } from './run-score.js';

/**
 * Scores `scoreDemoDir`'s parts.csv against its rules.json into
 * `out`/score-demo.csv (and its .plan.json), printing through `say`.
 * Paths are given as the caller wants them shown (relative to the working
 * directory). Returns the exit code `orthodrome score` would have.
 */
export async function demoScore(scoreDemoDir: string, out: string, say: (s: string) => void): Promise<number> {
  say('== PX-7 parts: incoming mesh check of a lot of four stamped parts (orthodrome score, gates from a rules file)');
  say(`  orthodrome score ${join(scoreDemoDir, 'parts.csv')} --rules ${join(scoreDemoDir, 'rules.json')} -o ${join(out, 'score-demo.csv')}`);
  const code = await runScore([join(scoreDemoDir, 'parts.csv')], {
    rules: join(scoreDemoDir, 'rules.json'), output: join(out, 'score-demo.csv'), jobs: '1', quiet: true,
  });
  say(
    code === 1
      ? '  GATE FAILED (as intended): the lid from the worn die fails its gates above, so `orthodrome score` exits 1 here; the demo goes on\n'
      : `  unexpected: every part passed (exit ${code}); the worn-die lid should have failed its gates\n`,
  );
  return code;
}
