/**
 * Summarises .cpuprofile files: the functions and files with the most self time.
 *
 *   node --enable-source-maps --import tsx bench/lib/summarise-cpu-profile.ts ROOT TOP FILE.cpuprofile...
 *
 * Runs in its own process because source maps are only kept for modules loaded while they are
 * switched on: the project's TypeScript files named in the profiles are imported here (src/ only:
 * those modules do nothing when imported), through the same tsx transform the profiled process
 * used, so `findSourceMap` turns each function's generated position back into its source line.
 */
import { readFileSync } from 'node:fs';
import { findSourceMap } from 'node:module';
import { basename } from 'node:path';
import { pathToFileURL } from 'node:url';
import { resultLine } from './child-result.ts';
import {
  profileMilliseconds,
  selfTimeByFile,
  selfTimeByFunction,
  type CpuProfile,
  type LocateLine,
  type SelfTime,
} from './cpu-profile.ts';

export interface ProfileSummary {
  readonly name: string;
  readonly wallMilliseconds: number;
  readonly busyMilliseconds: number;
  readonly functions: readonly SelfTime[];
  readonly files: readonly SelfTime[];
}

async function sourceLocator(profiles: readonly CpuProfile[], root: string): Promise<LocateLine> {
  const sources = pathToFileURL(`${root}/src/`).href;
  const urls = new Set<string>();
  for (const profile of profiles) for (const node of profile.nodes) urls.add(node.callFrame.url);
  for (const url of urls) if (url.startsWith(sources) && /\.tsx?$/.test(url)) await import(url);
  return (url, lineNumber, columnNumber) => {
    const entry = findSourceMap(url)?.findEntry(lineNumber, columnNumber);
    return entry !== undefined && 'originalLine' in entry ? entry.originalLine + 1 : null;
  };
}

async function main(argv: readonly string[]): Promise<ProfileSummary[]> {
  const [root, top, ...files] = argv;
  if (root === undefined || top === undefined || files.length === 0) {
    throw new Error('Usage: summarise-cpu-profile.ts ROOT TOP FILE.cpuprofile...');
  }
  const count = Number(top);
  const profiles = files.map((file) => JSON.parse(readFileSync(file, 'utf8')) as CpuProfile);
  const locate = await sourceLocator(profiles, root);
  return profiles.map((profile, i) => {
    const time = profileMilliseconds(profile);
    return {
      name: basename(files[i] ?? ''),
      wallMilliseconds: time.wall,
      busyMilliseconds: time.busy,
      functions: selfTimeByFunction(profile, root, locate).slice(0, count),
      files: selfTimeByFile(profile, root).slice(0, count),
    };
  });
}

process.stdout.write(resultLine(await main(process.argv.slice(2))));
