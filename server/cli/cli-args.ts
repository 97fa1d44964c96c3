import { resolve } from 'node:path';

/** Wrong use of the command line: exit code 2. */
export class UsageError extends Error {}
/** A file or value that cannot be used: exit code 1. */
export class InputError extends Error {}

export type Flags = Record<string, string | true>;

/** Splits argv into positionals and --flags; `valued` names the flags that take a value. */
export function parseArgs(argv: string[], valued: Set<string>, bare: Set<string>): { positional: string[]; flags: Flags } {
  const positional: string[] = [];
  const flags: Flags = {};
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === '-h' || arg === '--help') {
      flags.help = true;
      continue;
    }
    if (arg.startsWith('--')) {
      const eq = arg.indexOf('=');
      const name = arg.slice(2, eq < 0 ? undefined : eq);
      if (valued.has(name)) {
        const value = eq >= 0 ? arg.slice(eq + 1) : argv[++i];
        if (value === undefined) throw new UsageError(`--${name} needs a value`);
        flags[name] = value;
      } else if (bare.has(name) && eq < 0) flags[name] = true;
      else throw new UsageError(`unknown option --${name}`);
      continue;
    }
    positional.push(arg);
  }
  return { positional, flags };
}

export function numberFlag(flags: Flags, name: string, opts: { int?: boolean; min: number; max: number }): number | undefined {
  const raw = flags[name];
  if (raw === undefined) return undefined;
  const v = Number(raw);
  if (raw === true || raw.trim() === '' || !Number.isFinite(v) || (opts.int && !Number.isInteger(v)) || v < opts.min || v > opts.max) {
    throw new UsageError(`--${name} must be ${opts.int ? 'an integer' : 'a number'} from ${opts.min} to ${opts.max}, got "${raw}"`);
  }
  return v;
}

/** Paths are relative to where the user ran `npm run` (npm moves the cwd to the project root). */
export function userPath(p: string): string {
  return resolve(process.env.INIT_CWD ?? process.cwd(), p);
}

export const round = (x: number, d: number) => Math.round(x * 10 ** d) / 10 ** d;
