/**
 * The WebAssembly modules the project carries (src/core/*.wat, compiled into *-wasm.ts by
 * `npm run wasm`): each generated file holds exactly what its source compiles to, so a .wat edited
 * without rebuilding fails here; and the switch that turns them off does.
 */
import { readFileSync } from 'node:fs';
import { afterEach, describe, expect, it } from 'vitest';
import { compileWat, generatedText, projectPath, WASM_MODULES } from '../../scripts/wasm-modules.ts';
import { growMemory, instantiateModule, useWebAssembly } from '../../src/core/webassembly.ts';
import { RECORD_SCANNER_WASM } from '../../src/core/record-scanner-wasm.ts';

afterEach(() => useWebAssembly(true));

describe('the WebAssembly modules', () => {
  for (const module of WASM_MODULES) {
    it(`${module.generated} is ${module.wat} compiled as it stands (run \`npm run wasm\` after editing it)`, async () => {
      const bytes = await compileWat(module);
      expect(readFileSync(projectPath(module.generated), 'utf8')).toBe(generatedText(module, bytes));
    });
  }

  it('are instantiated in this Node, and not while switched off', () => {
    expect(instantiateModule(RECORD_SCANNER_WASM)).not.toBeNull();
    useWebAssembly(false);
    expect(instantiateModule(RECORD_SCANNER_WASM)).toBeNull();
  });

  it('grow their memory by whole 64 kB pages, and say so when the engine refuses', () => {
    const memory = new WebAssembly.Memory({ initial: 1, maximum: 4 });
    expect(growMemory(memory, 65_536)).toBe(true);
    expect(memory.buffer.byteLength).toBe(65_536);
    expect(growMemory(memory, 65_537)).toBe(true);
    expect(memory.buffer.byteLength).toBe(2 * 65_536);
    // Past the memory's maximum (4 pages): refused, the memory as it was.
    expect(growMemory(memory, 5 * 65_536)).toBe(false);
    expect(memory.buffer.byteLength).toBe(2 * 65_536);
  });
});
