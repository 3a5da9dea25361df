/**
 * Reading a verb's arguments: positionals, options with values ("--table t", "--table=t", "-o t"),
 * repeatable options, and "-" meaning standard input or output. Anything unknown is a usage error.
 */
import { usageFailure } from './failure.ts';

export interface OptionSpec {
  /** Long name without dashes, e.g. "table". */
  readonly name: string;
  /** One letter, e.g. "o" for "-o". */
  readonly short?: string;
  /** Allowed values; any text when absent. */
  readonly choices?: readonly string[];
  /** May be given more than once; values are kept in order. */
  readonly repeatable?: boolean;
}

export interface ParsedArgs {
  readonly positionals: readonly string[];
  /** Values per option name, in the order given. */
  readonly options: ReadonlyMap<string, readonly string[]>;
}

export function parseArgs(verb: string, argv: readonly string[], specs: readonly OptionSpec[]): ParsedArgs {
  const positionals: string[] = [];
  const options = new Map<string, string[]>();
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i] ?? '';
    if (arg === '--') {
      positionals.push(...argv.slice(i + 1));
      break;
    }
    if (arg === '-' || !arg.startsWith('-')) {
      positionals.push(arg);
      continue;
    }
    const { spec, inline } = findSpec(verb, arg, specs);
    const value = inline ?? argv[++i];
    if (value === undefined) throw usageFailure(verb, `the option ${arg} needs a value.`);
    if (spec.choices && !spec.choices.includes(value)) {
      throw usageFailure(verb, `${optionName(spec)} "${value}" is not one of ${spec.choices.join(', ')}.`, `Choose one of ${spec.choices.join(', ')}.`);
    }
    const list = options.get(spec.name) ?? [];
    if (list.length > 0 && !spec.repeatable) throw usageFailure(verb, `${optionName(spec)} was given more than once.`, 'Give it once.');
    list.push(value);
    options.set(spec.name, list);
  }
  return { positionals, options };
}

function findSpec(verb: string, arg: string, specs: readonly OptionSpec[]): { spec: OptionSpec; inline: string | undefined } {
  const long = arg.startsWith('--');
  const body = arg.slice(long ? 2 : 1);
  const equals = body.indexOf('=');
  const name = equals === -1 ? body : body.slice(0, equals);
  const inline = equals === -1 ? undefined : body.slice(equals + 1);
  const spec = specs.find((s) => (long ? s.name === name : s.short === name));
  if (spec === undefined) {
    const known = specs.map(optionName).join(', ');
    throw usageFailure(verb, `unknown option ${long ? '--' : '-'}${name}.`, known === '' ? undefined : `Options of "levelwise ${verb}": ${known}.`);
  }
  return { spec, inline };
}

function optionName(spec: OptionSpec): string {
  return `--${spec.name}`;
}

/** The value of an option given once, or undefined. */
export function optionValue(args: ParsedArgs, name: string): string | undefined {
  return args.options.get(name)?.[0];
}

/** Exactly `count` positionals, named for the error message, e.g. ["RECIPE", "FILE"]. */
export function positionals(verb: string, args: ParsedArgs, names: readonly string[]): string[] {
  if (args.positionals.length < names.length) {
    const missing = names.slice(args.positionals.length).join(' and ');
    throw usageFailure(verb, `${missing} is missing.`);
  }
  if (args.positionals.length > names.length) {
    throw usageFailure(verb, `too many arguments: ${args.positionals.slice(names.length).map((a) => `"${a}"`).join(' ')}.`);
  }
  return [...args.positionals];
}
