import { InputError } from '../core/errors.js';
import { STUDY_FORMAT, STUDY_VERSION } from './schema.js';

/**
 * Bring a parsed study file up to the current version before validation. Version 1 is the
 * first; later versions add a step here (v1 → v2 …) so old files keep opening.
 */
export function migrateStudy(raw: unknown): unknown {
  if (!raw || typeof raw !== 'object' || Array.isArray(raw)) {
    throw new InputError('(file)', 'a study file must be a JSON object');
  }
  const obj = raw as Record<string, unknown>;
  if (obj.format !== STUDY_FORMAT) {
    throw new InputError('format', `expected "${STUDY_FORMAT}" — this does not look like a study file`);
  }
  const version = obj.version;
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 1) {
    throw new InputError('version', 'must be a positive whole number');
  }
  if (version > STUDY_VERSION) {
    throw new InputError('version', `file version ${version} is newer than this program understands (${STUDY_VERSION})`);
  }
  return obj;
}
