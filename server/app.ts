import express, { type Express } from 'express';
import helmet from 'helmet';
import { CHARTJS_DIR, PUBLIC_DIR, VIEWS_DIR } from './paths.js';
import { errorHandler, notFound } from './web/errors.js';
import { StudyStore } from './scenario/store.js';
import { studyRouter } from './web/study.js';
import { kineticsRouter } from './web/kinetics.js';
import { cellRouter } from './web/cell.js';
import { plantRouter } from './web/plant.js';
import { reportRouter } from './web/report.js';

export interface AppOptions {
  /** Folder for saved studies (default: STUDY_DIR env or ./data/studies). */
  studyDir?: string;
}

/** Build the Express app (no listening here: server/main.ts listens, tests drive it in-process). */
export function createApp(options: AppOptions = {}): Express {
  const app = express();
  const store = new StudyStore(options.studyDir ?? process.env.STUDY_DIR ?? 'data/studies');
  app.locals.store = store;

  app.disable('x-powered-by');
  app.set('view engine', 'ejs');
  app.set('views', VIEWS_DIR);
  app.set('trust proxy', false);

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          styleSrc: ["'self'"],
          imgSrc: ["'self'", 'data:'],
          fontSrc: ["'self'"],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          frameAncestors: ["'none'"],
        },
      },
      crossOriginEmbedderPolicy: false,
    }),
  );

  app.use('/assets', express.static(PUBLIC_DIR, { maxAge: '1h', index: false }));
  app.use('/vendor/chart.umd.min.js', (_req, res) => res.sendFile('chart.umd.min.js', { root: CHARTJS_DIR, maxAge: '1d' }));

  app.use(express.json({ limit: '12mb' }));
  app.use(express.urlencoded({ extended: false, limit: '5mb', parameterLimit: 5000 }));

  app.get('/favicon.ico', (_req, res) => {
    res.status(204).end();
  });

  app.get('/healthz', (_req, res) => {
    res.status(200).json({ status: 'ok' });
  });

  app.use(studyRouter(store));
  app.use(kineticsRouter(store));
  app.use(cellRouter(store));
  app.use(plantRouter(store));
  app.use(reportRouter(store));

  app.use(notFound);
  app.use(errorHandler);
  return app;
}
