// The engine in lib/circuit runs unchanged in a browser Web Worker, on the server and on the
// command line (issue: "pure TypeScript … no React, Next.js or database imports"). This walks
// every engine source file and fails on an import from outside lib/circuit (other than the
// platform-free libraries the stack names for validation and numerics), or on a Node- or
// browser-only global.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const root = path.resolve(__dirname, '../../../lib/circuit');
/** Packages that run the same in a worker, on the server and in the CLI. */
const PURE_PACKAGES = new Set(['zod', 'mathjs']);

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = path.join(dir, name);
    if (statSync(p).isDirectory()) return sources(p);
    return p.endsWith('.ts') ? [p] : [];
  });
}

describe('engine boundary', () => {
  const files = sources(root);
  it('finds the engine sources', () => {
    expect(files.length).toBeGreaterThan(20);
  });
  for (const file of files) {
    const rel = path.relative(root, file);
    it(`${rel} imports only engine files and uses no platform globals`, () => {
      const text = readFileSync(file, 'utf8');
      for (const m of text.matchAll(/(?:import|export)[^'"]*from\s+['"]([^'"]+)['"]/g)) {
        const spec = m[1];
        if (PURE_PACKAGES.has(spec)) continue;
        expect(spec.startsWith('.'), `${rel} imports ${spec}`).toBe(true);
        expect(path.resolve(path.dirname(file), spec).startsWith(root), `${rel} imports ${spec} from outside lib/circuit`).toBe(true);
      }
      // Code only: comments may mention these words.
      const code = text.replace(/\/\*[\s\S]*?\*\//g, '').replace(/\/\/.*$/gm, '');
      for (const g of [/\bprocess\./, /\brequire\(/, /\bwindow\./, /\bdocument\./, /\bBuffer\b/, /\b__dirname\b/, /\bglobalThis\b/, /\bconsole\./]) {
        expect(g.test(code), `${rel} uses ${g.source}`).toBe(false);
      }
    });
  }
});
