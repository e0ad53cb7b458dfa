/** Bundles the CLI into the single file `cli/dist/vanbay.js`, the package's `bin`. */
import { readFileSync } from 'node:fs';
import { build } from 'esbuild';

const pkg = JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as {
  version: string;
};

// One file, no splitting: esbuild still wraps each module reached only through `await import()` in
// a lazy initialiser, so a command's code (zod, the schemas) runs only when program.ts loads it.
await build({
  entryPoints: [new URL('./index.ts', import.meta.url).pathname],
  outfile: new URL('./dist/vanbay.js', import.meta.url).pathname,
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'esm',
  minify: true,
  legalComments: 'none',
  define: { __VANBAY_VERSION__: JSON.stringify(pkg.version) },
  // Some bundled packages still call require(); give the ESM bundle one.
  banner: {
    js: "import { createRequire as __vanbayRequire } from 'node:module'; const require = __vanbayRequire(import.meta.url);",
  },
});
