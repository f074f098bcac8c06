import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from '../../src/http/config.ts';
import { loadWorkerConfig } from '../../src/http/worker-config.ts';
import { redactedQueueUrl, redisConnection } from '../../src/jobs/queue-connection.ts';
import { fromWireJson, toWireJson } from '../../src/jobs/wire-json.ts';

describe('job-queue configuration (README "Configuration")', () => {
  it('without QUEUE_URL the service keeps its embedded worker threads', () => {
    expect(loadConfig({}).queue).toBeUndefined();
  });

  it('QUEUE_URL: redis:// or rediss://, password in the URL, per-plan cap from PLAN_CELL_CONCURRENCY', () => {
    const config = loadConfig({
      QUEUE_URL: 'redis://:s3cret@queue.example:6379/2',
      PLAN_CELL_CONCURRENCY: '3',
    });
    expect(config.queue).toEqual({ url: 'redis://:s3cret@queue.example:6379/2', planConcurrency: 3 });
    expect(loadConfig({ QUEUE_URL: 'rediss://queue.example:6380' }).queue?.planConcurrency).toBe(8);
    expect(() => loadConfig({ QUEUE_URL: 'http://queue.example' })).toThrow(/redis:\/\/ or rediss:\/\//);
    expect(() => loadConfig({ QUEUE_URL: 'not a url' })).toThrow(ConfigError);
    expect(() => loadConfig({ QUEUE_URL: 'redis://q:6379', QUEUE_TLS_CA_FILE: '/ca.pem' })).toThrow(/rediss/);
    expect(() => loadConfig({ QUEUE_URL: 'redis://q:6379', PLAN_CELL_CONCURRENCY: '0' })).toThrow(
      /PLAN_CELL_CONCURRENCY/,
    );
  });

  it('rediss:// turns TLS on; the logged URL hides the password', () => {
    expect(redisConnection({ url: 'rediss://:pw@q:6380' })).toMatchObject({ tls: {} });
    expect(redisConnection({ url: 'redis://:pw@q:6379' })).not.toHaveProperty('tls');
    expect(redactedQueueUrl('redis://:pw@q:6379')).toBe('redis://:***@q:6379');
  });

  it('WORKER_KEY must not be one of the API keys (it reads uploads across tenants)', () => {
    const env = { HOST: '0.0.0.0', API_KEYS: 'alpha,beta' };
    expect(loadConfig({ ...env, WORKER_KEY: 'gamma' }).workerKey).toBe('gamma');
    expect(() => loadConfig({ ...env, WORKER_KEY: 'beta' })).toThrow(/WORKER_KEY/);
  });

  it('npm run worker needs QUEUE_URL; SERVICE_URL must be a URL', () => {
    expect(() => loadWorkerConfig({})).toThrow(/QUEUE_URL/);
    expect(() => loadWorkerConfig({ QUEUE_URL: 'redis://q:6379', SERVICE_URL: 'planner' })).toThrow(
      /SERVICE_URL/,
    );
    const config = loadWorkerConfig({
      QUEUE_URL: 'redis://q:6379',
      SERVICE_URL: 'http://planner:8080',
      WORKER_KEY: 'w',
      WORKERS: '3',
      WORKER_LOCK_SECONDS: '10',
    });
    expect(config).toEqual({
      queue: { url: 'redis://q:6379' },
      threads: 3,
      lockSeconds: 10,
      inputs: { serviceUrl: 'http://planner:8080', workerKey: 'w' },
    });
  });
});

describe('wire JSON (cells and results on the queue)', () => {
  it('typed arrays, ±∞ and NaN come back as they went, bit for bit', () => {
    const value = {
      image: { nx: 2, ny: 1, data: new Float64Array([Math.PI, -0]) },
      mask: new Uint8Array([1, 0, 1]),
      planes: [new Float32Array([1.5, Number.NaN])],
      psnr: Number.POSITIVE_INFINITY,
      low: Number.NEGATIVE_INFINITY,
      nan: Number.NaN,
      label: 'R 2',
    };
    const back = fromWireJson<typeof value>(toWireJson(value));
    expect(back.image.data).toBeInstanceOf(Float64Array);
    expect(Array.from(back.image.data)).toEqual([Math.PI, -0]);
    expect(Object.is(back.image.data[1], -0)).toBe(true);
    expect(back.mask).toEqual(new Uint8Array([1, 0, 1]));
    expect(back.planes[0]).toBeInstanceOf(Float32Array);
    expect(Number.isNaN(back.planes[0][1])).toBe(true);
    expect(back.psnr).toBe(Number.POSITIVE_INFINITY);
    expect(back.low).toBe(Number.NEGATIVE_INFINITY);
    expect(Number.isNaN(back.nan)).toBe(true);
    expect(back.label).toBe('R 2');
  });

  it('a view into a larger buffer sends only its own elements', () => {
    const whole = new Float64Array([1, 2, 3, 4]);
    const back = fromWireJson<Float64Array>(toWireJson(whole.subarray(1, 3)));
    expect(Array.from(back)).toEqual([2, 3]);
  });
});
