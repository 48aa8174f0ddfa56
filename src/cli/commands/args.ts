/**
 * Argument parsing on node:util's parseArgs, with usage errors that name the command.
 *
 * @module
 */
import { parseArgs } from 'node:util';
import { UsageError } from './io.js';

/** One option of a command: a flag (boolean) or a string, possibly repeated. */
export interface OptionSpec {
  readonly type: 'string' | 'boolean';
  readonly short?: string;
  readonly multiple?: boolean;
}
type Options = Record<string, OptionSpec>;

/** The parsed values of a command's options. */
export type Values<O extends Options> = {
  [K in keyof O]?: O[K]['type'] extends 'boolean'
    ? boolean
    : O[K]['multiple'] extends true
      ? string[]
      : string;
};

/** Parses a command's arguments; unknown options and missing values become a UsageError. */
export function parse<O extends Options>(
  command: string,
  argv: readonly string[],
  options: O,
  positionals: { readonly min: number; readonly max: number; readonly usage: string },
): { values: Values<O>; positionals: string[] } {
  let parsed: { values: Values<O>; positionals: string[] };
  try {
    parsed = parseArgs({ args: [...argv], options, allowPositionals: true, strict: true }) as unknown as {
      values: Values<O>;
      positionals: string[];
    };
  } catch (e) {
    throw new UsageError(`uvsky ${command}: ${(e as Error).message}\nusage: ${positionals.usage}`, {
      argument: command,
    });
  }
  const n = parsed.positionals.length;
  if (n < positionals.min || n > positionals.max) {
    const what =
      n < positionals.min
        ? 'missing argument'
        : `unexpected argument '${parsed.positionals[positionals.max]}'`;
    throw new UsageError(`uvsky ${command}: ${what}\nusage: ${positionals.usage}`, { argument: command });
  }
  return parsed;
}

/** A required string option. */
export function required(command: string, name: string, value: unknown, usage: string): string {
  if (typeof value !== 'string' || value === '') {
    throw new UsageError(`uvsky ${command}: --${name} is required\nusage: ${usage}`, { argument: name });
  }
  return value;
}

/** An integer option within bounds. */
export function integer(
  command: string,
  name: string,
  value: unknown,
  min: number,
  max: number,
): number | undefined {
  if (value === undefined) return undefined;
  const x = Number(value);
  if (typeof value !== 'string' || !Number.isInteger(x) || x < min || x > max) {
    throw new UsageError(
      `uvsky ${command}: --${name} = ${JSON.stringify(value)}; give an integer in [${min}, ${max}]`,
      {
        argument: name,
      },
    );
  }
  return x;
}

/** A finite number option. */
export function number(command: string, name: string, value: unknown): number | undefined {
  if (value === undefined) return undefined;
  const x = Number(value);
  if (typeof value !== 'string' || value.trim() === '' || !Number.isFinite(x)) {
    throw new UsageError(`uvsky ${command}: --${name} = ${JSON.stringify(value)}; give a finite number`, {
      argument: name,
    });
  }
  return x;
}
