import { readFileSync, readdirSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

// lib/rules runs in the browser and on the server and takes "today" as an argument: it may import
// only its own files and must not read the clock.
const rulesDirectory = path.resolve(__dirname, '../../../lib/rules');
const sources = readdirSync(rulesDirectory)
  .filter((file) => file.endsWith('.ts'))
  .map((file) => ({ file, text: readFileSync(path.join(rulesDirectory, file), 'utf8') }));

describe('lib/rules stays pure', () => {
  it.each(sources.map(({ file, text }) => [file, text]))('%s imports only sibling files', (_file, text) => {
    const specifiers = [...text.matchAll(/(?:import|export)[^'"]*?from\s+['"]([^'"]+)['"]/g)].map((match) => match[1]);
    for (const specifier of specifiers) expect(specifier).toMatch(/^\.\/[a-z-]+$/);
    expect(text).not.toMatch(/\brequire\(|import\(/);
  });

  it.each(sources.map(({ file, text }) => [file, text]))('%s never reads the clock', (_file, text) => {
    expect(text).not.toMatch(/Date\.now\(|new Date\(\s*\)|performance\.now\(|process\./);
  });
});
