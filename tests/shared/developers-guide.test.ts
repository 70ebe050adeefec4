// The contributor guide and the three folder READMEs name real things: every backticked path exists
// (placeholders such as <resource> stand for any name in an existing folder), every bare file name is
// some file of the project, and every `npm run x` / `npm x` command is a script of package.json.
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../..', import.meta.url));
const GUIDES = ['DEVELOPERS.md', 'shared/README.md', 'server/README.md', 'src/README.md'];
const SKIP_DIRS = new Set(['node_modules', '.git', 'dist', 'coverage', 'test-results', '.data']);

const fileNames = new Set<string>();
/** Every folder, as a path from the root. */
const folders: string[] = [];
(function walk(dir: string) {
  for (const entry of readdirSync(join(root, dir), { withFileTypes: true })) {
    if (SKIP_DIRS.has(entry.name)) continue;
    const path = dir ? `${dir}/${entry.name}` : entry.name;
    if (entry.isDirectory()) {
      folders.push(path);
      walk(path);
    } else fileNames.add(entry.name);
  }
})('');

/** Backticked spans of a Markdown file, fenced blocks left out. */
function spans(text: string): string[] {
  return [...text.replace(/```[\s\S]*?```/g, '').matchAll(/`([^`\n]+)`/g)].map((m) => m[1].trim());
}

const isPathLike = (s: string) => !/[\s'"]/.test(s) && !s.startsWith('/') && !s.startsWith('@') && (/\//.test(s) || /\.(ts|vue|md|json|mjs|csv)$/.test(s) || s === '.env.example');

/** The part of a path before its first placeholder (<resource>, NNNN-name, *): that folder must exist. */
function fixedPart(path: string): string {
  const parts = path.split('/');
  const i = parts.findIndex((p) => /[<>*…]|NNNN/.test(p));
  return i < 0 ? path : parts.slice(0, i).join('/');
}

/**
 * A path is read from the guide's folder, the root, or one of the three code roots (prose such as "on the
 * server `services/imports.ts`"); a bare file name is any file of the project; a bare folder name
 * (a README's list of feature folders) is any folder inside the guide's own folder.
 */
function exists(guide: string, path: string): boolean {
  const fixed = fixedPart(path);
  const here = dirname(guide);
  if ([here, '.', 'server', 'shared', 'src'].some((b) => existsSync(join(root, b, fixed)))) return true;
  if (fixed.includes('/') || fixed !== path) return false;
  return fileNames.has(basename(path)) || folders.some((f) => (here === '.' || f.startsWith(`${here}/`)) && basename(f) === path);
}

const scripts = Object.keys(JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')).scripts as Record<string, string>);

describe.each(GUIDES)('%s', (guide) => {
  const text = readFileSync(join(root, guide), 'utf8');

  it('names only paths and files that exist', () => {
    const missing = spans(text).filter(isPathLike).filter((p) => !exists(guide, p.replace(/\/$/, '')));
    expect(missing).toEqual([]);
  });

  it('names only npm scripts that package.json has', () => {
    const commands = spans(text).flatMap((s) => [...s.matchAll(/\bnpm (?:run )?([\w:-]+)/g)].map((m) => m[1]));
    expect(commands.filter((c) => !scripts.includes(c) && c !== 'install')).toEqual([]);
  });
});
