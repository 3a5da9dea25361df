/**
 * Summarises .cpuprofile files: the functions and files with the most self time.
 *
 *   node --enable-source-maps --import tsx bench/lib/summarise-cpu-profile.ts ROOT TOP FILE.cpuprofile...
 *
 * Runs in its own process because source maps are only kept for modules loaded while they are
 * switched on: the project's TypeScript files named in the profiles are imported here (src/ only:
 * those modules do nothing when imported), through the same tsx transform the profiled process
 * used, so `findSourceMap` turns each function's generated position back into its source line.
 * The command line runs as one bundled file (see bin/levelwise.js): its positions go back to their
 * source files and lines through the bundle's own source map, written beside it.
 */
import { readFileSync } from 'node:fs';
import { findSourceMap, SourceMap } from 'node:module';
import { basename } from 'node:path';
import { pathToFileURL } from 'node:url';
import { resultLine } from './child-result.ts';
import {
  profileMilliseconds,
  selfTimeByFile,
  selfTimeByFunction,
  type CpuProfile,
  type LocateLine,
  type LocateSource,
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

/** The command line's bundles (its own and its reading threads'), as bin/levelwise.js writes them. */
const BUNDLE = /\/node_modules\/\.cache\/levelwise-cli\/build-[0-9a-f]+\/(cli|read-thread)\.mjs$/;

function bundleLocator(profiles: readonly CpuProfile[]): LocateSource {
  const maps = new Map<string, SourceMap | null>();
  for (const profile of profiles) {
    for (const { callFrame } of profile.nodes) {
      if (maps.has(callFrame.url) || !BUNDLE.test(callFrame.url)) continue;
      let map: SourceMap | null = null;
      try {
        map = new SourceMap(JSON.parse(readFileSync(new URL(`${callFrame.url}.map`), 'utf8')));
      } catch {
        // The bundle was made again since the profile was taken: positions stay as they are.
      }
      maps.set(callFrame.url, map);
    }
  }
  return (url, lineNumber, columnNumber) => {
    const entry = maps.get(url)?.findEntry(lineNumber, columnNumber);
    if (entry === undefined || !('originalSource' in entry)) return null;
    return { url: new URL(entry.originalSource, url).href, line: entry.originalLine + 1 };
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
  const locateSource = bundleLocator(profiles);
  return profiles.map((profile, i) => {
    const time = profileMilliseconds(profile);
    return {
      name: basename(files[i] ?? ''),
      wallMilliseconds: time.wall,
      busyMilliseconds: time.busy,
      functions: selfTimeByFunction(profile, root, locate, locateSource).slice(0, count),
      files: selfTimeByFile(profile, root, locateSource).slice(0, count),
    };
  });
}

process.stdout.write(resultLine(await main(process.argv.slice(2))));
