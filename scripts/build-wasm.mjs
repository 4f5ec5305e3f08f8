// Compiles the bootstrap's four-lane kernel (wasm/bootstrap-lanes.ts, AssemblyScript) to
// WebAssembly with SIMD: wasm/build/bootstrap-lanes.wasm. Run by `npm install` (the `prepare`
// script), and before the tests and every server build; it does nothing when the output is newer
// than the source. The compiler is the `assemblyscript` package from the registry (no download).
// Without the file the engine runs its TypeScript kernel, with the same results, more slowly.
import { existsSync, mkdirSync, renameSync, statSync } from 'node:fs';
import { join } from 'node:path';

const root = join(import.meta.dirname, '..');
const source = join(root, 'wasm', 'bootstrap-lanes.ts');
const output = join(root, 'wasm', 'build', 'bootstrap-lanes.wasm');

export async function buildWasm({ quiet = false } = {}) {
  if (existsSync(output) && statSync(output).mtimeMs >= statSync(source).mtimeMs) return output;
  mkdirSync(join(root, 'wasm', 'build'), { recursive: true });
  const { default: asc } = await import('assemblyscript/asc');
  const started = performance.now();
  // Written under a name of its own, then renamed: builds running side by side never see half a file.
  const partial = `${output}.${process.pid}.part`;
  const { error, stderr } = await asc.main(
    [source, '--outFile', partial, '-O3', '--runtime', 'stub', '--noAssert', '--enable', 'simd', '--importMemory', '--noExportMemory'],
    { stdout: { write() {} } },
  );
  if (error) throw new Error(`AssemblyScript could not compile ${source}: ${error.message}\n${stderr.toString()}`);
  renameSync(partial, output);
  if (!quiet) console.log(`built ${output} in ${((performance.now() - started) / 1000).toFixed(1)} s`);
  return output;
}

if (import.meta.url === `file://${process.argv[1]}`) await buildWasm();
