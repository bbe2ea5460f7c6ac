#!/usr/bin/env node
/**
 * Guard run by `npm test`: a clone of the repository must stand on its own, so no tracked file may
 * name a path outside it. Flags any mention of the shared folder kept beside the project (dot-dot,
 * slash, "shared") and any relative path (`../…`) that,
 * resolved from the file's own folder, leaves the repository root. Exits 1 with one line per hit.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';

const root = execFileSync('git', ['rev-parse', '--show-toplevel'], { encoding: 'utf8' }).trim();
const files = execFileSync('git', ['ls-files', '-z'], { cwd: root, encoding: 'utf8' })
  .split('\0')
  .filter((f) => f && f !== 'package-lock.json' && !f.startsWith('test/fixtures/'));

// A run of at least one "../" followed by a path-like character.
const RELATIVE_UP = /(?:\.\.\/)+[A-Za-z0-9_.-]*/g;
const hits = [];
for (const file of files) {
  let text;
  try {
    text = readFileSync(join(root, file), 'utf8');
  } catch {
    continue;
  }
  if (text.includes('\0')) continue; // binary
  const lines = text.split('\n');
  lines.forEach((line, i) => {
    if (/\.\.[/\\]shared\b/.test(line)) {
      hits.push(`${file}:${i + 1}: names the shared folder beside the project, which a clone does not have`);
      return;
    }
    for (const m of line.matchAll(RELATIVE_UP)) {
      const target = resolve(root, dirname(file), m[0]);
      const rel = relative(root, target);
      if (rel === '..' || rel.startsWith('..' + sep)) {
        hits.push(`${file}:${i + 1}: path "${m[0]}" leads outside the repository`);
      }
    }
  });
}
if (hits.length > 0) {
  console.error(`checkRepoPaths: ${hits.length} reference(s) to paths outside the repository:`);
  for (const h of hits) console.error('  ' + h);
  process.exit(1);
}
console.log(`checkRepoPaths: ${files.length} tracked files, none names a path outside the repository`);
