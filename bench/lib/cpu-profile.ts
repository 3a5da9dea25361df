/**
 * Reading V8 CPU profiles (`node --cpu-prof` writes them as .cpuprofile JSON): self time per
 * function and per source file, so the report says where the time goes before anyone optimises.
 *
 * A profile is a tree of nodes (one per call path) plus a list of samples, each naming the node
 * that was on top of the stack, with the time since the previous sample. A function's self time
 * is the time of the samples taken while it was on top, summed over every path it appears on.
 */

export interface CpuProfileNode {
  readonly id: number;
  readonly callFrame: {
    readonly functionName: string;
    readonly url: string;
    /** 0-based, as V8 writes it. */
    readonly lineNumber: number;
    readonly columnNumber: number;
  };
  readonly children?: readonly number[];
}

export interface CpuProfile {
  readonly nodes: readonly CpuProfileNode[];
  readonly startTime: number;
  readonly endTime: number;
  /** Node id on top of the stack for each sample. */
  readonly samples: readonly number[];
  /** Microseconds since the previous sample (the first since startTime). */
  readonly timeDeltas: readonly number[];
}

/**
 * The 1-based source line of a generated position, when a source map knows it. tsx serves
 * TypeScript minified onto one line, so raw profile lines say nothing without this.
 */
export type LocateLine = (url: string, lineNumber: number, columnNumber: number) => number | null;

/**
 * The source file (URL) and 1-based line of a generated position in a bundle, when its source map
 * knows them: the command line runs as one bundled file (bin/levelwise.js), whose functions belong
 * to many source files.
 */
export type LocateSource = (url: string, lineNumber: number, columnNumber: number) => { readonly url: string; readonly line: number } | null;

export interface SelfTime {
  /** "name (file:line)", or V8's own entries such as "(garbage collector)". */
  readonly label: string;
  readonly milliseconds: number;
  /** Share of the busy time (every sample but "(idle)"), 0–1. */
  readonly share: number;
}

/**
 * V8 attributes each sample's delta to the sample before it (the delta is the time until the
 * next sample), so sample i gets timeDeltas[i + 1]; the last sample gets the time to the end.
 */
function sampleDurations(profile: CpuProfile): number[] {
  const { samples, timeDeltas } = profile;
  let elapsed = 0;
  for (const delta of timeDeltas) elapsed += delta;
  return samples.map((_, i) => (i + 1 < samples.length ? (timeDeltas[i + 1] ?? 0) : Math.max(0, profile.endTime - profile.startTime - elapsed)));
}

const IDLE = '(idle)';

function selfTimes(profile: CpuProfile, keyOf: (node: CpuProfileNode) => string): SelfTime[] {
  const byId = new Map(profile.nodes.map((node) => [node.id, node]));
  const durations = sampleDurations(profile);
  const totals = new Map<string, number>();
  let all = 0;
  profile.samples.forEach((id, i) => {
    const node = byId.get(id);
    // Idle time is the process waiting (start-up hands work to the loader's thread): not ours.
    if (node === undefined || node.callFrame.functionName === IDLE) return;
    const micros = durations[i] ?? 0;
    all += micros;
    const key = keyOf(node);
    totals.set(key, (totals.get(key) ?? 0) + micros);
  });
  return [...totals]
    .map(([label, micros]) => ({ label, milliseconds: micros / 1000, share: all > 0 ? micros / all : 0 }))
    .sort((a, b) => b.milliseconds - a.milliseconds);
}

/** A short place for a script URL: the path from the project root, or the package inside node_modules. */
export function shortPlace(url: string, root: string): string {
  const path = url.startsWith('file://') ? decodeURIComponent(url.slice('file://'.length)) : url;
  const modules = path.lastIndexOf('/node_modules/');
  if (modules !== -1) return path.slice(modules + '/node_modules/'.length);
  const prefix = root.endsWith('/') ? root : `${root}/`;
  return path.startsWith(prefix) ? path.slice(prefix.length) : path;
}

function functionLabel(node: CpuProfileNode, root: string, locate: LocateLine, locateSource?: LocateSource): string {
  const { functionName, url, lineNumber, columnNumber } = node.callFrame;
  const name = functionName === '' ? '(anonymous)' : functionName;
  if (url === '') return name;
  const source = locateSource?.(url, lineNumber, columnNumber) ?? null;
  if (source !== null) return `${name} (${shortPlace(source.url, root)}:${source.line})`;
  const line = locate(url, lineNumber, columnNumber) ?? lineNumber + 1;
  return `${name} (${shortPlace(url, root)}:${line})`;
}

const generatedLine: LocateLine = (_url, lineNumber) => lineNumber + 1;

function fileLabel(node: CpuProfileNode, root: string, locateSource?: LocateSource): string {
  const { functionName, url, lineNumber, columnNumber } = node.callFrame;
  if (url === '') return functionName.startsWith('(') ? functionName : '(V8 and Node built-ins)';
  return shortPlace(locateSource?.(url, lineNumber, columnNumber)?.url ?? url, root);
}

/** Self time per function, most first. */
export function selfTimeByFunction(profile: CpuProfile, root: string, locate: LocateLine = generatedLine, locateSource?: LocateSource): SelfTime[] {
  return selfTimes(profile, (node) => functionLabel(node, root, locate, locateSource));
}

/** Self time per source file (built-ins without a script grouped together), most first. */
export function selfTimeByFile(profile: CpuProfile, root: string, locateSource?: LocateSource): SelfTime[] {
  return selfTimes(profile, (node) => fileLabel(node, root, locateSource));
}

/** Wall time the profile covers, and the part of it not idle, in milliseconds. */
export function profileMilliseconds(profile: CpuProfile): { wall: number; busy: number } {
  const busy = selfTimes(profile, () => 'all')[0]?.milliseconds ?? 0;
  return { wall: (profile.endTime - profile.startTime) / 1000, busy };
}
