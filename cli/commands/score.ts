/**
 * `orthodrome score INPUTS… [--rules FILE] [-o OUT.csv|OUT.jsonl] [--jobs N] [--shard I/N] [--resume]`
 * and `orthodrome score merge PARTS… -o OUT`: batch scoring with gates
 * (cli/score/run-score.ts, merge.ts).
 */
import { Option, type Command } from 'commander';
import { action } from '../run.js';
import { maxInputSizeOption } from '../load.js';
import { runScore, metricList, DEFAULT_TIME_LIMIT_S, type ScoreOpts } from '../score/run-score.js';
import { runMerge } from '../score/merge.js';
import { METRIC_GROUPS, DEFAULT_GROUPS } from '../../src/score/index.js';

/** Registers the command and its `merge` subcommand. */
export function registerScore(program: Command): void {
  const score = program
    .command('score')
    .description('score many meshes: metrics, gates from a rules file, results as CSV or JSON Lines; parallel, resumable, sharded for array jobs')
    .argument('[inputs...]', 'mesh files, folders (searched recursively), globs, - (paths on standard input) or manifest .csv files')
    .option('--rules <file>', 'rules file (JSON) of gates on the metrics; a mesh failing one is a fail row, exit 1')
    .option('-o, --output <file>', 'results file, .csv or .jsonl, appended and flushed per mesh; {shard} is replaced by the shard index')
    .option('--metrics <groups>', `metric groups, comma-separated, or all (${METRIC_GROUPS.join(', ')}; default ${DEFAULT_GROUPS.join(',')}; groups the rules need are added)`)
    .option('--jobs <n>', 'worker threads (default: the number of cores)')
    .option('--shard <spec>', 'score one slice: I/N (I from 0), env (Kubernetes JOB_COMPLETION_INDEX with ORTHODROME_SHARDS, or Slurm SLURM_ARRAY_TASK_ID) or env/N')
    .option('--resume', 'continue the results file: meshes already scored with the same settings are kept, not scored again')
    .option('--retry-errors', 'with --resume, score error rows again')
    .option('--time-limit <seconds>', `per-mesh time limit; over it the mesh is an error row (default ${DEFAULT_TIME_LIMIT_S}; 0 for none)`)
    .option('--mesh-memory <size>', 'per-mesh memory limit (K/M/G); a mesh whose estimate is over it is an error row (default 80% of memory / jobs)')
    .option('--heat-samples <n>', 'sources sampled for the heat-versus-exact error (group heat; default 3)')
    .addOption(maxInputSizeOption())
    .option('--quiet', 'no per-mesh lines or progress bar on stderr')
    .addOption(new Option('--list-metrics', 'list the metrics by group and exit'))
    .action(
      action(async (inputs: string[], o: ScoreOpts & { listMetrics?: boolean }) => {
        if (o.listMetrics) {
          process.stdout.write(metricList());
          return 0;
        }
        return runScore(inputs, o);
      }),
    );
  score
    .command('merge')
    .description('join the results of the shards of one run into one report, checking that no mesh is missing or duplicated')
    .argument('<parts...>', 'results files of the shards (each with its .plan.json beside it)')
    .option('-o, --output <file>', 'merged report, .csv or .jsonl (written atomically)')
    // `-o` after `merge` may be taken by `score`'s own -o (commander reads a parent's options anywhere): accept either
    .action(action(async (parts: string[], o: { output?: string }) => runMerge(parts, o.output ?? (score.opts() as { output?: string }).output)));
}
