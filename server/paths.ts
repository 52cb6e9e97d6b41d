import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/** Project root: the nearest folder above this file holding package.json (works from server/ and dist/server/). */
function findRoot(): string {
  let dir = path.dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 6; i++) {
    if (existsSync(path.join(dir, 'package.json')) && existsSync(path.join(dir, 'views'))) return dir;
    dir = path.dirname(dir);
  }
  return process.cwd();
}

export const ROOT = findRoot();
export const VIEWS_DIR = path.join(ROOT, 'views');
export const PUBLIC_DIR = path.join(ROOT, 'public');
export const SCENARIOS_DIR = path.join(ROOT, 'scenarios');
export const CHARTJS_DIR = path.join(ROOT, 'node_modules', 'chart.js', 'dist');
