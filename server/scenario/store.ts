import { randomBytes } from 'node:crypto';
import { closeSync, existsSync, fsyncSync, mkdirSync, openSync, readdirSync, readFileSync, renameSync, statSync, writeSync } from 'node:fs';
import path from 'node:path';
import { InputError } from '../core/errors.js';
import { SCENARIOS_DIR } from '../paths.js';
import { migrateStudy } from './migrate.js';
import { studySchema, type Study } from './schema.js';

export interface StudySummary {
  id: string;
  name: string;
  chemistry: Study['chemistry'];
  synthetic: boolean;
  /** Examples ship with the program and are read-only; saving one makes a copy. */
  example: boolean;
  updatedAt?: string;
}

export class StudyNotFoundError extends InputError {
  constructor(id: string) {
    super('study', `no study with id "${id}"`);
    this.name = 'StudyNotFoundError';
  }
}

const ID_PATTERN = /^[a-z0-9-]{1,80}$/;

/** Parse and validate study JSON text (migrating older versions). Throws InputError/ZodError. */
export function parseStudyText(text: string): Study {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (err) {
    throw new InputError('(file)', `not valid JSON (${(err as Error).message})`);
  }
  return studySchema.parse(migrateStudy(raw));
}

/**
 * Studies: the examples shipped in scenarios/ (read-only) and the user's saved studies in a
 * folder (one `<id>.study.json` each, written atomically: temp file, fsync, rename).
 */
export class StudyStore {
  private readonly examples = new Map<string, Study>();
  private readonly exampleOrder: string[] = [];

  constructor(private readonly dir: string, examplesDir: string = SCENARIOS_DIR) {
    if (existsSync(examplesDir)) {
      for (const file of readdirSync(examplesDir).filter((f) => f.endsWith('.study.json')).sort()) {
        const id = `example-${file.replace(/\.study\.json$/, '').toLowerCase().replace(/[^a-z0-9-]+/g, '-')}`;
        this.examples.set(id, parseStudyText(readFileSync(path.join(examplesDir, file), 'utf8')));
        this.exampleOrder.push(id);
      }
    }
  }

  /** The study opened when none is named: the first example. */
  defaultId(): string {
    const first = this.exampleOrder[0];
    if (first) return first;
    const saved = this.list()[0];
    if (saved) return saved.id;
    throw new InputError('study', 'no studies are available (scenarios/ is empty)');
  }

  list(): StudySummary[] {
    const out: StudySummary[] = this.exampleOrder.map((id) => {
      const s = this.examples.get(id)!;
      return { id, name: s.name, chemistry: s.chemistry, synthetic: s.synthetic, example: true };
    });
    if (existsSync(this.dir)) {
      for (const file of readdirSync(this.dir).filter((f) => f.endsWith('.study.json')).sort()) {
        const id = file.replace(/\.study\.json$/, '');
        try {
          const s = this.get(id);
          out.push({ id, name: s.name, chemistry: s.chemistry, synthetic: s.synthetic, example: false, updatedAt: statSync(path.join(this.dir, file)).mtime.toISOString() });
        } catch {
          // A damaged file is skipped in the list, never overwritten.
        }
      }
    }
    return out;
  }

  isExample(id: string): boolean {
    return this.examples.has(id);
  }

  get(id: string): Study {
    const example = this.examples.get(id);
    if (example) return structuredClone(example);
    if (!ID_PATTERN.test(id)) throw new StudyNotFoundError(id);
    const file = path.join(this.dir, `${id}.study.json`);
    if (!existsSync(file)) throw new StudyNotFoundError(id);
    return parseStudyText(readFileSync(file, 'utf8'));
  }

  /**
   * Save a study. Examples are never changed: saving one (or passing no id) creates a new
   * saved study and returns its id. The study is validated before anything is written.
   */
  save(study: Study, id?: string): string {
    const valid = studySchema.parse(study);
    const targetId = id && !this.examples.has(id) && ID_PATTERN.test(id) ? id : this.newId(valid.name);
    mkdirSync(this.dir, { recursive: true });
    const file = path.join(this.dir, `${targetId}.study.json`);
    const tmp = `${file}.tmp-${process.pid}-${randomBytes(4).toString('hex')}`;
    const fd = openSync(tmp, 'w');
    try {
      writeSync(fd, JSON.stringify(valid, null, 2) + '\n');
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    renameSync(tmp, file);
    return targetId;
  }

  private newId(name: string): string {
    const slug = name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 40) || 'study';
    return `${slug}-${randomBytes(3).toString('hex')}`;
  }
}
