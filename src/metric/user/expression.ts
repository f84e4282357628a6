/**
 * Arithmetic expressions of a user metric (`conformal:1/y`, `form:1;0;cos(v)^2`):
 * parsed by `jsep` (a small expression parser that builds a syntax tree and
 * never evaluates anything), then compiled once by our own code into a tree
 * of closures over a whitelist of operators, functions and constants. No
 * `eval`, no `Function`, no property access: an expression can reach only
 * the variables it is given.
 *
 * Precedence is the mathematical one: `^` (and `**`) binds tighter than
 * `*` and `/`, is right-associative, and `-x^2` is −(x²) (jsep applies a
 * unary minus to the token next to it, so the tree is rewritten; a
 * parenthesised `(-x)^2` is kept as written, common practice in calculators
 * and computer algebra).
 *
 * A malformed expression or an unknown name is a `USAGE` error on one line
 * that names the column (from 1) and marks it with ‸ in the text.
 */
import jsep from 'jsep';
import { usageError } from '../../errors.js';

/** A compiled expression: reads its variables from `vars` (in the order they were declared). */
export type Compiled = (vars: Float64Array) => number;

/** A compiled expression and what it uses. */
export interface CompiledExpression {
  /** Evaluates at `vars` (one value per declared variable, in order). */
  evaluate: Compiled;
  /** True when no variable occurs (the value is the same everywhere). */
  constant: boolean;
  /** The expression as given. */
  text: string;
}

const FUNCTIONS: Record<string, { arity: [number, number]; f: (...a: number[]) => number }> = {
  sqrt: { arity: [1, 1], f: Math.sqrt },
  exp: { arity: [1, 1], f: Math.exp },
  log: { arity: [1, 1], f: Math.log },
  ln: { arity: [1, 1], f: Math.log },
  log10: { arity: [1, 1], f: Math.log10 },
  log2: { arity: [1, 1], f: Math.log2 },
  sin: { arity: [1, 1], f: Math.sin },
  cos: { arity: [1, 1], f: Math.cos },
  tan: { arity: [1, 1], f: Math.tan },
  asin: { arity: [1, 1], f: Math.asin },
  acos: { arity: [1, 1], f: Math.acos },
  atan: { arity: [1, 1], f: Math.atan },
  atan2: { arity: [2, 2], f: Math.atan2 },
  sinh: { arity: [1, 1], f: Math.sinh },
  cosh: { arity: [1, 1], f: Math.cosh },
  tanh: { arity: [1, 1], f: Math.tanh },
  abs: { arity: [1, 1], f: Math.abs },
  floor: { arity: [1, 1], f: Math.floor },
  ceil: { arity: [1, 1], f: Math.ceil },
  sign: { arity: [1, 1], f: Math.sign },
  hypot: { arity: [1, 8], f: Math.hypot },
  pow: { arity: [2, 2], f: Math.pow },
  min: { arity: [1, 8], f: Math.min },
  max: { arity: [1, 8], f: Math.max },
};
const CONSTANTS: Record<string, number> = { pi: Math.PI, e: Math.E };

/** Names an expression may call, for help texts. */
export const EXPRESSION_FUNCTIONS = Object.keys(FUNCTIONS);

// jsep is configured once: `^` is power (not bitwise xor), operators we do not evaluate are removed so they
// are syntax errors at their column, and two hooks record where identifiers start and mark parenthesised groups
let configured = false;
function configure(): void {
  if (configured) return;
  configured = true;
  for (const op of ['||', '??', '&&', '|', '^', '&', '==', '!=', '===', '!==', '<', '>', '<=', '>=', '<<', '>>', '>>>', '%']) jsep.removeBinaryOp(op);
  for (const op of ['!', '~']) jsep.removeUnaryOp(op);
  jsep.addBinaryOp('^', 11, true);
  jsep.addBinaryOp('**', 11, true);
  jsep.hooks.add('gobble-token', function (this: unknown, env: { context?: unknown; node?: jsep.Expression }) {
    const p = env.context as { index: number; code: number; gobbleGroup(): jsep.Expression | false; gobbleIdentifier(): jsep.Expression; gobbleTokenProperty(n: jsep.Expression): jsep.Expression };
    const start = p.index;
    if (p.code === 40) {
      const inner = p.gobbleGroup();
      if (inner) env.node = { type: 'Group', expression: inner, start };
    } else if ((p.code >= 65 && p.code <= 90) || (p.code >= 97 && p.code <= 122) || p.code === 95) {
      const id = p.gobbleIdentifier();
      id.start = start;
      env.node = p.gobbleTokenProperty(id);
    }
  });
}

/** `text` with ‸ inserted before 0-based `index`. */
function marked(text: string, index: number): string {
  const i = Math.max(0, Math.min(text.length, index));
  return `${text.slice(0, i)}‸${text.slice(i)}`;
}

/** A one-line `USAGE` error at 0-based `index` of `text`. */
function errorAt(label: string, text: string, index: number, what: string): Error {
  return usageError(`${what} at column ${index + 1}: ${marked(text, index)}`, label);
}

/** Where `needle` first occurs in `text` (0 when absent). */
function find(text: string, needle: string): number {
  return Math.max(0, text.indexOf(needle));
}

/**
 * Parses and compiles `text`. `variables` are the names it may use, in the
 * order `evaluate` reads them; `label` prefixes errors (e.g. `--metric conformal`).
 */
export function compileExpression(text: string, variables: readonly string[], label: string): CompiledExpression {
  configure();
  if (text.trim() === '') throw usageError('empty expression', label);
  let ast: jsep.Expression;
  try {
    ast = jsep(text);
  } catch (e) {
    const err = e as { index?: number; description?: string; message?: string };
    throw errorAt(label, text, err.index ?? 0, err.description ?? String(err.message));
  }
  let usesVariable = false;
  const compile = (n: jsep.Expression): Compiled => {
    switch (n.type) {
      case 'Literal': {
        const v = n.value;
        if (typeof v !== 'number') throw errorAt(label, text, find(text, String(n.raw)), `'${String(n.raw)}' is not a number`);
        return () => v;
      }
      case 'Group':
        return compile(n.expression as jsep.Expression);
      case 'Identifier': {
        const name = n.name as string, at = (n.start as number | undefined) ?? find(text, name);
        const k = variables.indexOf(name);
        if (k >= 0) {
          usesVariable = true;
          return (a) => a[k]!;
        }
        if (name in CONSTANTS) {
          const c = CONSTANTS[name]!;
          return () => c;
        }
        const known = [...variables, ...Object.keys(CONSTANTS)].join(', ');
        throw errorAt(label, text, at, name in FUNCTIONS ? `'${name}' is a function: write ${name}(…)` : `unknown name '${name}' (variables and constants: ${known})`);
      }
      case 'UnaryExpression': {
        const arg = compile(n.argument as jsep.Expression);
        if (n.operator === '-') return (a) => -arg(a);
        if (n.operator === '+') return arg;
        throw errorAt(label, text, find(text, n.operator as string), `operator '${n.operator as string}' is not supported`);
      }
      case 'BinaryExpression': {
        const op = n.operator as string;
        let left = n.left as jsep.Expression;
        // -a^b: jsep bound the minus to a; a power binds tighter, so this is −(a^b)
        if ((op === '^' || op === '**') && left.type === 'UnaryExpression' && (left.operator === '-' || left.operator === '+')) {
          const inner: jsep.Expression = { type: 'BinaryExpression', operator: op, left: left.argument as jsep.Expression, right: n.right as jsep.Expression };
          return compile({ type: 'UnaryExpression', operator: left.operator, argument: inner, prefix: true });
        }
        const l = compile(left), r = compile(n.right as jsep.Expression);
        switch (op) {
          case '+': return (a) => l(a) + r(a);
          case '-': return (a) => l(a) - r(a);
          case '*': return (a) => l(a) * r(a);
          case '/': return (a) => l(a) / r(a);
          case '^': case '**': {
            // small whole exponents as products: exact and fast
            if ((n.right as jsep.Expression).type === 'Literal' && (n.right as jsep.Literal).value === 2) return (a) => { const x = l(a); return x * x; };
            return (a) => Math.pow(l(a), r(a));
          }
          default:
            throw errorAt(label, text, find(text, op), `operator '${op}' is not supported`);
        }
      }
      case 'CallExpression': {
        const callee = n.callee as jsep.Expression;
        const at = (callee.start as number | undefined) ?? 0;
        if (callee.type !== 'Identifier') throw errorAt(label, text, at, 'only the listed functions can be called');
        const name = callee.name as string, fn = FUNCTIONS[name];
        if (!fn) throw errorAt(label, text, at, `unknown function '${name}' (functions: ${EXPRESSION_FUNCTIONS.join(', ')})`);
        const args = (n.arguments as jsep.Expression[]).map(compile);
        if (args.length < fn.arity[0] || args.length > fn.arity[1]) {
          const want = fn.arity[0] === fn.arity[1] ? `${fn.arity[0]}` : `${fn.arity[0]} to ${fn.arity[1]}`;
          throw errorAt(label, text, at, `${name} takes ${want} argument(s), got ${args.length}`);
        }
        const f = fn.f;
        if (args.length === 1) { const a0 = args[0]!; return (a) => f(a0(a)); }
        if (args.length === 2) { const a0 = args[0]!, a1 = args[1]!; return (a) => f(a0(a), a1(a)); }
        return (a) => f(...args.map((g) => g(a)));
      }
      case 'Compound': {
        const second = (n.body as jsep.Expression[])[1];
        const at = (second?.start as number | undefined) ?? (second?.type === 'Literal' ? find(text.slice(1), String(second.raw)) + 1 : text.length);
        throw errorAt(label, text, at, 'one expression expected (an operator is missing)');
      }
      default: {
        const at = (n.start as number | undefined) ?? 0;
        throw errorAt(label, text, at, `this kind of expression (${n.type}) is not supported`);
      }
    }
  };
  const evaluate = compile(ast);
  if (!usesVariable) {
    const c = evaluate(new Float64Array(variables.length));
    return { evaluate: () => c, constant: true, text };
  }
  return { evaluate, constant: false, text };
}

/**
 * Splits `text` at top-level `sep` characters (not inside parentheses), so
 * `max(1,z),0,0` splits into three parts for `sep` = ','. Returns each part
 * with its 0-based start in `text`.
 */
export function splitTopLevel(text: string, sep: string): { part: string; start: number }[] {
  const out: { part: string; start: number }[] = [];
  let depth = 0, start = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (c === '(' || c === '[') depth++;
    else if (c === ')' || c === ']') depth--;
    else if (c === sep && depth === 0) {
      out.push({ part: text.slice(start, i), start });
      start = i + 1;
    }
  }
  out.push({ part: text.slice(start), start });
  return out;
}
