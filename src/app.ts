import { randomUUID } from 'node:crypto';
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import type { Writable } from 'node:stream';
import fastifyMultipart from '@fastify/multipart';
import fastifySwagger from '@fastify/swagger';
import fastifySwaggerUi from '@fastify/swagger-ui';
import Fastify, {
  type FastifyInstance,
  type FastifyPluginAsync,
  type FastifyRequest,
  type RouteOptions,
} from 'fastify';
import { serializerCompiler, validatorCompiler } from 'fastify-type-provider-zod';
import { coilMapRoutes } from '../routes/coil-maps.ts';
import { healthRoutes } from '../routes/health.ts';
import { imageRoutes } from '../routes/images.ts';
import { maskRoutes } from '../routes/masks.ts';
import { openapiRoutes } from '../routes/openapi.ts';
import { phantomRoutes } from '../routes/phantoms.ts';
import { planRoutes } from '../routes/plans.ts';
import { problemRoutes } from '../routes/problems.ts';
import { rawRoutes } from '../routes/raw.ts';
import { reconstructionRoutes } from '../routes/reconstructions.ts';
import { resultRoutes } from '../routes/results.ts';
import { scanTimeRoutes } from '../routes/scan-time.ts';
import { workerInputRoutes } from '../routes/worker-inputs.ts';
import { defaultLimits, type Limits } from './core/limits.ts';
import { installApiKeyAuth } from './http/auth.ts';
import { installErrorHandling } from './http/error-handler.ts';
import { clientErrorHandler, frameworkErrorHandler } from './http/framework-errors.ts';
import { swaggerOptions, swaggerUiOptions } from './http/openapi.ts';
import { type Tenancy, tenancyOf } from './http/tenant.ts';
import { type CellRunner, LocalCellRunner } from './jobs/cell-runner.ts';
import { DataLifecycle, defaultRetention, type RetentionPolicy } from './jobs/lifecycle.ts';
import { type PlanEngine, PlanQueue } from './jobs/plan-queue.ts';
import type { QueueSettings } from './jobs/queue-connection.ts';
import { Store } from './jobs/store.ts';
import { WorkerPool } from './jobs/worker-pool.ts';
import { buildTable, planCells } from './plan/index.ts';
import {
  CoilMapService,
  MaskService,
  PhantomService,
  PlanService,
  RawDataService,
  ReconstructionService,
  ScanTimeService,
  UploadService,
} from './services/index.ts';

export interface AppOptions {
  /** Where the SQLite file lives; default ./data. */
  dataDir?: string;
  /** Overrides of the safety limits (src/core/limits.ts). */
  limits?: Partial<Limits>;
  /** pino request logs: false (default) for none, a level, or true for 'info'. */
  logger?: boolean | { level?: string };
  /** Where log lines go (default stdout); tests pass a stream to capture them. */
  logStream?: Writable;
  /** When non-empty, every /v1 request needs one of these keys. */
  apiKeys?: string[];
  /** Worker threads (default: the cores). */
  workers?: number;
  /** Plans queued or running before POST /v1/plans answers 429 (default 16). */
  maxQueuedPlans?: number;
  /** Request-driven worker tasks (uploads, masks, reconstructions…) in flight before 429 (default 8 per worker). */
  maxRequestTasks?: number;
  /** Largest JSON body in bytes (default 8 MB). */
  maxJsonBytes?: number;
  /** Plan engine override (tests); default src/plan. */
  planEngine?: PlanEngine;
  /** Retention limits and cleanup interval (src/jobs/lifecycle.ts); defaults 7 days, 2 GiB, 10 minutes. */
  retention?: Partial<RetentionPolicy>;
  /** Each API key sees and deletes only what it created (needs apiKeys). */
  tenantIsolation?: boolean;
  /**
   * Plan cells on a Redis job queue (QUEUE_URL) for `npm run worker` processes instead of the
   * worker threads; `planConcurrency` caps one plan's cells in the queue at once (default 8).
   */
  queue?: QueueSettings & { planConcurrency?: number };
  /** The worker processes' key for the uploads their cells name (needed with apiKeys). */
  workerKey?: string;
}

export interface Services {
  store: Store;
  pool: WorkerPool;
  plans: PlanQueue;
  /** Where plan cells run: the worker threads, or the Redis job queue. */
  cells: CellRunner;
  /** Deletion cascades and the retention policy. */
  lifecycle: DataLifecycle;
  /** The caller's owner digest and what it may see (tenant isolation). */
  tenancy: (request: FastifyRequest) => Tenancy;
  limits: Limits;
  /** The service layer the routes call (src/services): build, render and store results. */
  reconstructions: ReconstructionService;
  masks: MaskService;
  uploads: UploadService;
  coilMaps: CoilMapService;
  raw: RawDataService;
  phantoms: PhantomService;
  scanTimes: ScanTimeService;
  planning: PlanService;
  /** Every route registered, for the spec-vs-routes test. */
  routes: Array<{ method: string; url: string; hidden: boolean }>;
}

declare module 'fastify' {
  interface FastifyInstance {
    services: Services;
  }
}

/**
 * The /v1 resource plugins, one per file under routes/. They are registered inside one
 * encapsulated context whose hook requires the API key (src/http/auth.ts), so a route is protected
 * because of where it is registered, not because of how a client spelt its URL.
 * To add a /v1 resource, append it here.
 */
const apiPlugins: FastifyPluginAsync[] = [
  phantomRoutes,
  imageRoutes,
  coilMapRoutes,
  rawRoutes,
  maskRoutes,
  reconstructionRoutes,
  resultRoutes,
  scanTimeRoutes,
  planRoutes,
  // one line per /v1 resource plugin
];
/**
 * Open routes: no patient data, needed by load balancers and browsers before any key is known.
 * routes/web.ts (the planner page, owned by the web module) is registered when present.
 */
const openPlugins: FastifyPluginAsync[] = [healthRoutes, openapiRoutes, problemRoutes];
const optionalPlugins = [new URL('../routes/web.ts', import.meta.url)];

/** The plan engine (src/plan): cells are expanded and tables built here; runCell runs in the workers. */
const defaultPlanEngine: PlanEngine = { cells: planCells, buildTable };

/** Builds the fastify instance; used by main.ts and by the API tests (isolated on temp dirs). */
export async function buildApp(options: AppOptions = {}): Promise<FastifyInstance> {
  const isolation = options.tenantIsolation ?? false;
  if (isolation && (options.apiKeys ?? []).length === 0) {
    throw new Error('tenant isolation needs API keys: each key is a tenant');
  }
  const limits: Limits = { ...defaultLimits, ...options.limits };
  const logger =
    options.logger === undefined || options.logger === false
      ? false
      : {
          level: options.logger === true ? 'info' : (options.logger.level ?? 'info'),
          ...(options.logStream ? { stream: options.logStream } : {}),
          redact: ['req.headers.authorization', 'req.headers["x-api-key"]'],
        };
  const app = Fastify({
    logger,
    genReqId: () => randomUUID(),
    requestIdHeader: 'x-request-id',
    bodyLimit: options.maxJsonBytes ?? 8 * 1024 * 1024,
    // A client that never finishes sending its request is cut off (408) instead of holding a socket forever;
    // responses such as event streams are not limited by this.
    requestTimeout: 300_000,
    // Ids are at most 200 characters (idParams); longer path segments are refused by the router (414).
    routerOptions: { ignoreTrailingSlash: true, maxParamLength: 200 },
    // Router and HTTP-parser errors answer problem+json (RFC 9457) like every other error.
    frameworkErrors: frameworkErrorHandler,
    clientErrorHandler,
  });
  // JSON routes take JSON only: without this, fastify's built-in text/plain parser would turn a
  // text body into a string and the answer would be a 400 instead of 415 Unsupported Media Type.
  app.removeContentTypeParser('text/plain');
  app.setValidatorCompiler(validatorCompiler);
  app.setSerializerCompiler(serializerCompiler);
  installErrorHandling(app);
  app.addHook('onSend', async (request, reply) => {
    reply.header('x-request-id', request.id);
    reply.header('x-content-type-options', 'nosniff');
  });

  const routes: Services['routes'] = [];
  app.addHook('onRoute', (route: RouteOptions) => {
    const methods = Array.isArray(route.method) ? route.method : [route.method];
    const hidden = Boolean((route.schema as { hide?: boolean } | undefined)?.hide);
    for (const method of methods) routes.push({ method, url: route.url, hidden });
  });

  const store = new Store(options.dataDir ?? './data');
  const workers = options.workers ?? availableParallelism();
  const pool = new WorkerPool(workers, options.maxRequestTasks ?? 8 * workers);
  const engine = options.planEngine ?? defaultPlanEngine;
  const deps = { pool, store, limits };
  let cells: CellRunner;
  try {
    cells = options.queue
      ? await (await import('./jobs/queue-cell-runner.ts')).QueueCellRunner.open(
          options.queue,
          options.queue.planConcurrency ?? 8,
          app.log,
        )
      : new LocalCellRunner(pool);
  } catch (error) {
    await pool.destroy();
    store.close();
    throw error;
  }
  const reconstructions = new ReconstructionService(deps);
  // Each plan row keeps its seed-1 reconstruction as a result of the plan (images to open from the table).
  const plans = new PlanQueue(
    store,
    cells,
    engine,
    limits,
    options.maxQueuedPlans ?? 16,
    app.log,
    (id, scored) => reconstructions.keepPlanRow(id, scored),
  );
  const lifecycle = new DataLifecycle(store, plans, { ...defaultRetention, ...options.retention }, app.log);
  const tenancy = (request: FastifyRequest) => tenancyOf(request, isolation);
  app.decorate('services', {
    store,
    pool,
    plans,
    cells,
    lifecycle,
    tenancy,
    limits,
    reconstructions,
    masks: new MaskService(deps),
    uploads: new UploadService(deps),
    coilMaps: new CoilMapService(deps),
    raw: new RawDataService(deps),
    phantoms: new PhantomService(deps),
    scanTimes: new ScanTimeService(deps),
    planning: new PlanService({ ...deps, plans }),
    routes,
  });
  app.addHook('onClose', async () => {
    lifecycle.stop();
    await plans.close();
    await cells.close();
    await pool.destroy();
    store.close();
  });

  try {
    await app.register(fastifySwagger, swaggerOptions);
    await app.register(fastifySwaggerUi, swaggerUiOptions);
    await app.register(fastifyMultipart, {
      limits: { fileSize: limits.maxUploadBytes, files: 2, fields: 8, parts: 10, fieldSize: 1024 },
    });
    for (const plugin of openPlugins) await app.register(plugin);
    if (options.queue) {
      await app.register(workerInputRoutes({ apiKeys: options.apiKeys ?? [], workerKey: options.workerKey }));
    }
    await app.register(async (api) => {
      installApiKeyAuth(api, options.apiKeys ?? []);
      for (const plugin of apiPlugins) await api.register(plugin);
    });
    for (const url of optionalPlugins) {
      if (!existsSync(url)) continue;
      const module = (await import(url.href)) as { default: FastifyPluginAsync };
      await app.register(module.default);
    }
    await app.ready();
  } catch (error) {
    // Do not leave worker threads, the queue or the database open behind a failed start.
    await cells.close();
    await pool.destroy();
    store.close();
    throw error;
  }
  plans.resume();
  lifecycle.start();
  return app;
}
