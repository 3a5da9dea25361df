/**
 * The project's WebAssembly modules (record-scanner.wat, row-copier.wat) compiled once per
 * thread, and the switch that turns them all off. Each module has a JavaScript twin that gives the
 * same results; the modules are only faster. Where WebAssembly or its SIMD instructions are not to
 * be had (an old engine, a Content-Security-Policy without 'wasm-unsafe-eval'), there is no
 * instance and the twin runs.
 */

let enabled = true;
const compiled = new Map<string, WebAssembly.Module | null>();

/**
 * Switches the WebAssembly modules on or off for this thread: the tests compare each with its
 * JavaScript twin, and LEVELWISE_NO_WASM=1 makes the command line run the twins (for measuring).
 */
export function useWebAssembly(on: boolean): void {
  enabled = on;
}

export function webAssemblyEnabled(): boolean {
  return enabled;
}

/** A new instance of the module whose bytes are `base64`; null where it cannot be had here. */
export function instantiateModule(base64: string): WebAssembly.Instance | null {
  if (!enabled) return null;
  let module = compiled.get(base64);
  if (module === undefined) {
    module = compile(base64);
    compiled.set(base64, module);
  }
  return module === null ? null : new WebAssembly.Instance(module, {});
}

const PAGE = 1 << 16;

/**
 * Grows `memory` to hold at least `bytes`; false when the engine refuses (out of memory), the
 * memory then as it was. Views of the memory must be made again after it grew.
 */
export function growMemory(memory: WebAssembly.Memory, bytes: number): boolean {
  const have = memory.buffer.byteLength;
  if (bytes <= have) return true;
  try {
    memory.grow(Math.ceil((bytes - have) / PAGE));
    return true;
  } catch {
    return false;
  }
}

function compile(base64: string): WebAssembly.Module | null {
  try {
    if (typeof WebAssembly !== 'object') return null;
    const bytes = Uint8Array.from(atob(base64), (c) => c.charCodeAt(0));
    // Validating first: an engine without SIMD refuses the module here rather than by throwing.
    if (!WebAssembly.validate(bytes)) return null;
    return new WebAssembly.Module(bytes);
  } catch {
    // Compiling refused (a Content-Security-Policy without 'wasm-unsafe-eval'): JavaScript it is.
    return null;
  }
}
