/**
 * Compiles the project's WebAssembly text sources (scripts/wasm-modules.ts) and writes their
 * bytes into the TypeScript files that carry them. Run by `npm run wasm` after editing a .wat file;
 * a test fails while a generated file is not current.
 */
import { writeFileSync } from 'node:fs';
import { compileWat, generatedText, projectPath, WASM_MODULES } from './wasm-modules.ts';

for (const module of WASM_MODULES) {
  const bytes = await compileWat(module);
  writeFileSync(projectPath(module.generated), generatedText(module, bytes));
  console.log(`wrote ${module.generated} (${bytes.length} bytes from ${module.wat})`);
}
