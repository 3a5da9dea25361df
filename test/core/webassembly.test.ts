/**
 * The WebAssembly modules the project carries (src/core/*.wat, compiled into *-wasm.ts by
 * `npm run wasm`): each generated file holds exactly what its source compiles to, so a .wat edited
 * without rebuilding fails here; and the switch that turns them off does.
 */
import { readFileSync } from 'node:fs';
import { afterEach, describe, expect, it } from 'vitest';
import { compileWat, generatedText, projectPath, WASM_MODULES } from '../../scripts/wasm-modules.ts';
import { instantiateModule, useWebAssembly } from '../../src/core/webassembly.ts';
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
});
