import { Router, type Request, type Response } from 'express';
import multer from 'multer';
import { InputError } from '../core/errors.js';
import { studySchema } from '../scenario/schema.js';
import { parseStudyText, type StudyStore } from '../scenario/store.js';
import { describeError } from './errors.js';
import { pageContext } from './page.js';

/** Largest study file accepted by the upload form (bytes). */
const MAX_STUDY_UPLOAD_BYTES = 5 * 1024 * 1024;
const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_STUDY_UPLOAD_BYTES, files: 1 } });

/** Run multer inside the handler so its refusals (file too large, wrong field, two files) become page errors. */
function readUpload(req: Request, res: Response): Promise<void> {
  return new Promise((resolve, reject) => {
    upload.single('studyFile')(req, res, (err: unknown) => {
      if (!err) return resolve();
      if (err instanceof multer.MulterError) {
        const reason =
          err.code === 'LIMIT_FILE_SIZE'
            ? `the file is larger than ${MAX_STUDY_UPLOAD_BYTES / (1024 * 1024)} MB`
            : err.code === 'LIMIT_UNEXPECTED_FILE' || err.code === 'LIMIT_FILE_COUNT'
              ? 'send one study file, in the field "studyFile"'
              : err.message;
        return reject(new InputError('studyFile', reason));
      }
      reject(err);
    });
  });
}

function fileNameFor(name: string): string {
  const slug = name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '') || 'study';
  return `${slug}.study.json`;
}

/** Study overview, upload/download, and the studies JSON API. */
export function studyRouter(store: StudyStore): Router {
  const r = Router();

  const renderHome = (req: Request, res: Response, status = 200, error?: unknown): void => {
    const ctx = pageContext(req, store, 'Study', '/');
    res.status(status).render('study', { ...ctx, error: error ? describeError(error).body.error : null });
  };

  r.get('/', (req, res) => renderHome(req, res));

  r.get('/studies/:id/download', (req, res) => {
    const study = store.get(req.params.id);
    res.setHeader('Content-Type', 'application/json; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="${fileNameFor(study.name)}"`);
    res.send(JSON.stringify(study, null, 2) + '\n');
  });

  r.post('/studies/upload', async (req, res) => {
    try {
      await readUpload(req, res);
      const text = req.file ? req.file.buffer.toString('utf8') : typeof req.body?.studyText === 'string' ? req.body.studyText : '';
      if (!text.trim()) throw new InputError('studyFile', 'choose a .study.json file or paste its text');
      const study = parseStudyText(text);
      const id = store.save(study);
      res.redirect(303, `/?study=${encodeURIComponent(id)}`);
    } catch (err) {
      const { status } = describeError(err);
      if (status >= 500) throw err;
      req.query.study = undefined;
      if (req.body) req.body.study = undefined;
      renderHome(req, res, status, err);
    }
  });

  // JSON API
  r.get('/api/v1/studies', (_req, res) => {
    res.json({ studies: store.list(), defaultStudy: store.defaultId() });
  });
  r.get('/api/v1/studies/:id', (req, res) => {
    res.json(store.get(req.params.id));
  });
  r.post('/api/v1/studies', (req, res) => {
    const study = studySchema.parse(req.body);
    const id = store.save(study);
    res.status(201).json({ id });
  });
  r.put('/api/v1/studies/:id', (req, res) => {
    if (store.isExample(req.params.id)) {
      throw new InputError('id', 'example studies are read-only; POST /api/v1/studies to save a copy');
    }
    store.get(req.params.id); // 400 when it does not exist
    const study = studySchema.parse(req.body);
    const id = store.save(study, req.params.id);
    res.json({ id });
  });

  return r;
}
