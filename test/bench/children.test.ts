import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { CLI, launcherFlags } from '../../bench/lib/children.ts';

describe('the command line as the benchmark starts it', () => {
  it('gets the node flags of the launcher’s first line, as npx and an installed levelwise do', () => {
    // None today: `env -S`, which a line with flags needs, is missing from BusyBox and older coreutils.
    expect(launcherFlags(readFileSync(CLI, 'utf8'))).toEqual([]);
    expect(launcherFlags('#!/usr/bin/env node\nrest')).toEqual([]);
    expect(launcherFlags('#!/usr/local/bin/node --a --b=1\n')).toEqual(['--a', '--b=1']);
    expect(() => launcherFlags('#!/bin/sh\n')).toThrow(/does not start node/);
  });
});
