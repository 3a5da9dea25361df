/**
 * src/core must run unchanged in a Web Worker and in Node: it may import neither React, nor the
 * DOM, nor node: modules. This test reads every file under src/core and fails on such an import.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const CORE = join(import.meta.dirname, '../../src/core');

function filesUnder(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? filesUnder(path) : [path];
  });
}

const FORBIDDEN_IMPORT = /from\s+['"](react|react-dom|react\/.*|node:.*|fs|path|os|child_process|stream)['"]/;
const FORBIDDEN_GLOBAL = /\b(document|window|localStorage|sessionStorage|navigator)\.[A-Za-z_]/;

describe('src/core stays framework-free', () => {
  const files = filesUnder(CORE).filter((f) => f.endsWith('.ts'));
  it('has files to check', () => expect(files.length).toBeGreaterThan(5));
  for (const file of files) {
    it(`${file.slice(CORE.length + 1)} imports no React, DOM or node: module`, () => {
      const text = readFileSync(file, 'utf8');
      expect(text).not.toMatch(FORBIDDEN_IMPORT);
      expect(text).not.toMatch(FORBIDDEN_GLOBAL);
    });
  }
});
