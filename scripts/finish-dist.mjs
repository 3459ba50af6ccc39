// Trunk post-build hook (Trunk.toml): finishes the static site.
// 0. Points the page at this build's bindings and main wasm module
//    (scripts/build-wasm.sh names them with a build id).
// 1. Writes the service worker's list of files and a version hash of them.
// 2. Refuses a page with an inline script (the Content-Security-Policy
//    allows none) or with an address on another site.
// Usage: run by trunk with TRUNK_STAGING_DIR set, or `node
// scripts/finish-dist.mjs dist` on a built site.
import { readdirSync, readFileSync, writeFileSync, statSync, rmSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { createHash } from 'node:crypto';

const dir = process.env.TRUNK_STAGING_DIR || process.argv[2] || 'dist';
const fail = (msg) => {
  console.error(`finish-dist: ${msg}`);
  process.exit(1);
};

const idPath = join(dir, '.kneepoint-build-id');
let id;
try {
  id = readFileSync(idPath, 'utf8').trim();
} catch {
  fail('no .kneepoint-build-id: scripts/build-wasm.sh did not run');
}
if (!/^[0-9a-f]{16}$/.test(id)) fail(`bad build id '${id}'`);
rmSync(idPath);
{
  const p = join(dir, 'index.html');
  const page = readFileSync(p, 'utf8');
  // Quoted or not (a minified page drops the quotes).
  const named = page
    // The rust link trunk was told to skip (index.html) has done its job.
    .replace(/\s*<link\b[^>]*\bdata-trunk-skip\b[^>]*>/, '')
    .replace(/(?<![\w-])kneepoint\.js(?=["'\s>])/g, `kneepoint-${id}.js`)
    .replace(/(?<![\w-])kneepoint_bg\.wasm(?=["'\s>])/g, `kneepoint_bg-${id}.wasm`);
  if (!new RegExp(`data-kneepoint-js=["']?\\./kneepoint-${id}\\.js`).test(named)) {
    fail('index.html has no data-kneepoint-js="./kneepoint.js" to point at this build');
  }
  writeFileSync(p, named);
}

function walk(d) {
  return readdirSync(d).flatMap((name) => {
    const p = join(d, name);
    return statSync(p).isDirectory() ? walk(p) : [p];
  });
}

const files = walk(dir)
  .map((p) => relative(dir, p).split(sep).join('/'))
  .filter((f) => f !== 'sw.js')
  .sort();

const html = readFileSync(join(dir, 'index.html'), 'utf8');
for (const m of html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/gi)) {
  if (!/\bsrc=/.test(m[1]) || m[2].trim() !== '') fail('index.html has an inline script');
}
if (/\s(?:src|href)=["']?(?:https?:)?\/\//i.test(html)) fail('index.html loads from another site');
for (const f of files.filter((f) => f.endsWith('.css'))) {
  if (/url\(\s*["']?(?:https?:)?\/\//i.test(readFileSync(join(dir, f), 'utf8'))) {
    fail(`${f} loads from another site`);
  }
}

const hash = createHash('sha256');
for (const f of files) {
  hash.update(f);
  hash.update(readFileSync(join(dir, f)));
}
const version = hash.digest('hex').slice(0, 16);
const assets = ['./', ...files.map((f) => `./${f}`)];
const swPath = join(dir, 'sw.js');
const sw = readFileSync(swPath, 'utf8');
if (!sw.includes('__KNEEPOINT_ASSETS__')) fail('sw.js has no file-list placeholder');
writeFileSync(
  swPath,
  sw
    .replace("'__KNEEPOINT_VERSION__'", JSON.stringify(version))
    .replace('__KNEEPOINT_ASSETS__', JSON.stringify(assets, null, 2)),
);
console.log(`finish-dist: service worker lists ${assets.length} files, version ${version}`);
