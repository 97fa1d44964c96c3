import { pathToFileURL } from 'node:url';
import { AudioInputError } from '../audio/audio-errors';
import { detectKickFile } from '../audio/kick-detection';
import { InputError, parseArgs, round, UsageError, userPath } from './cli-args';

const USAGE = `Usage: tuckline <command> [options]

Commands:
  detect <kick.wav|kick.mid>   Find the kick hits; prints JSON {source, sampleRate, durationSec, hits}
  stamp <kick> --shape <shape.json> --format csv|midi|wav --out <file>
                               Stamp the tuck shape at every hit and export the gain automation
  report <kick.wav> --bass <bass.wav> --shape <shape.json>
                               Measure kick plus bass before and after the tucks; prints JSON

Run "tuckline <command> --help" for a command's options.
`;

const DETECT_USAGE = `Usage: tuckline detect <kick.wav|kick.mid> [--kind audio|midi] [--threads 1|2]

Prints {"source":"audio"|"midi","sampleRate":48000|null,"durationSec":…,"hits":[{"timeSec":…,"strength":…},…]}
  --kind audio|midi   Force the kind of kick source (default: sniffed from the file)
  --threads 1|2       Threads for a WAV kick (default 1); the hits are the same either way
`;

async function detect(argv: string[], out: (s: string) => void): Promise<void> {
  const { positional, flags } = parseArgs(argv, new Set(['kind', 'threads']), new Set());
  if (flags.help) return out(DETECT_USAGE);
  if (positional.length !== 1) throw new UsageError('detect takes one kick file (tuckline detect --help)');
  const kind = flags.kind;
  if (kind !== undefined && kind !== 'audio' && kind !== 'midi') throw new UsageError('--kind must be audio or midi');
  const threadsFlag = flags.threads ?? '1';
  if (threadsFlag !== '1' && threadsFlag !== '2') throw new UsageError('--threads must be 1 or 2');
  const threads = threadsFlag === '1' ? 1 : 2;
  const result = await detectKickFile(userPath(positional[0]), { kind, threads });
  const json = {
    source: result.source,
    sampleRate: result.sampleRate,
    durationSec: round(result.durationSec, 6),
    hits: result.hits.map((h) => ({ timeSec: round(h.timeSec, 6), strength: round(h.strength, 4) })),
  };
  out(JSON.stringify(json) + '\n');
}

/** Runs the command line; returns the exit code (0 ok, 1 bad input, 2 bad usage). Never throws. */
export async function main(argv: string[], io: { out?: (s: string) => void; err?: (s: string) => void } = {}): Promise<number> {
  const out = io.out ?? ((s: string) => void process.stdout.write(s));
  const err = io.err ?? ((s: string) => void process.stderr.write(s));
  const [command, ...rest] = argv;
  try {
    if (command === undefined) throw new UsageError('no command given (tuckline --help)');
    if (command === '--help' || command === '-h' || command === 'help') {
      out(USAGE);
      return 0;
    }
    if (command === 'detect') await detect(rest, out);
    else if (command === 'stamp') await (await import('./export-commands')).stamp(rest, out);
    else if (command === 'report') await (await import('./export-commands')).report(rest, out);
    else throw new UsageError(`unknown command "${command}" (tuckline --help)`);
    return 0;
  } catch (e) {
    const code = e instanceof UsageError ? 2 : 1;
    err(`tuckline: ${oneLine(describe(e))}\n`);
    return code;
  }
}

function describe(e: unknown): string {
  if (e instanceof UsageError || e instanceof InputError || e instanceof AudioInputError) return e.message;
  // By name: the schema library is loaded only by the stamp and report commands.
  if (e instanceof Error && e.name === 'ZodError') return `invalid input: ${(e as Error & { issues?: Array<{ message?: string }> }).issues?.[0]?.message ?? 'unknown'}`;
  const errno = e as NodeJS.ErrnoException;
  if (errno && typeof errno.code === 'string' && errno.path) {
    const what = errno.code === 'ENOENT' ? 'no such file' : errno.code === 'EACCES' ? 'permission denied' : errno.code === 'EISDIR' ? 'is a directory' : errno.code;
    return `${errno.path}: ${what}`;
  }
  return `internal error: ${e instanceof Error ? e.message : String(e)}`;
}

function oneLine(s: string): string {
  return s.replace(/\s*\n\s*/g, ' ').trim();
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  process.exitCode = await main(process.argv.slice(2));
}
