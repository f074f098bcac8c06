import { describe, expect, it } from 'vitest';
import { defaultLimits } from '../../src/core/limits.ts';
import { ConfigError, isLoopbackHost, loadConfig } from '../../src/http/config.ts';

describe('configuration from the environment (issue contract: PORT 8080, HOST 127.0.0.1, DATA_DIR ./data, API_KEYS)', () => {
  it('defaults: port 8080 on 127.0.0.1, ./data, no keys, the documented limits', () => {
    const config = loadConfig({});
    expect(config.port).toBe(8080);
    expect(config.host).toBe('127.0.0.1');
    expect(config.dataDir.endsWith('/data')).toBe(true);
    expect(config.apiKeys).toEqual([]);
    expect(config.limits).toEqual({
      maxMatrixSide: 1024,
      maxIterations: 2000,
      maxPlanCells: 2000,
      maxUploadBytes: 64 * 1024 * 1024,
      maxKspacePoints: 65_536,
    });
    expect(config.limits).toEqual(defaultLimits);
  });

  it('a host other machines can reach requires API_KEYS', () => {
    expect(() => loadConfig({ HOST: '0.0.0.0' })).toThrow(ConfigError);
    expect(() => loadConfig({ HOST: '192.168.1.20', API_KEYS: ' ' })).toThrow(/API_KEYS/);
    const config = loadConfig({ HOST: '0.0.0.0', API_KEYS: 'alpha, beta' });
    expect(config.apiKeys).toEqual(['alpha', 'beta']);
  });

  it('loopback addresses (127.0.0.0/8, ::1, localhost; RFC 1122 3.2.1.3, RFC 4291 2.5.3) need no key', () => {
    for (const host of ['127.0.0.1', '127.8.9.10', '::1', 'localhost'])
      expect(isLoopbackHost(host)).toBe(true);
    for (const host of ['0.0.0.0', '::', '10.0.0.1', '128.0.0.1']) expect(isLoopbackHost(host)).toBe(false);
  });

  it('limits and sizes are read and range-checked', () => {
    const config = loadConfig({
      PORT: '9000',
      MAX_MATRIX_SIDE: '512',
      MAX_PLAN_CELLS: '50',
      MAX_KSPACE_POINTS: '1000',
      WORKERS: '3',
      DATA_DIR: '/tmp/x',
    });
    expect(config.port).toBe(9000);
    expect(config.limits.maxMatrixSide).toBe(512);
    expect(config.limits.maxPlanCells).toBe(50);
    expect(config.limits.maxKspacePoints).toBe(1000);
    expect(config.workers).toBe(3);
    expect(config.dataDir).toBe('/tmp/x');
    expect(() => loadConfig({ PORT: 'eighty' })).toThrow(/PORT/);
    expect(() => loadConfig({ MAX_MATRIX_SIDE: '-4' })).toThrow(/MAX_MATRIX_SIDE/);
    expect(() => loadConfig({ MAX_KSPACE_POINTS: '0' })).toThrow(/MAX_KSPACE_POINTS/);
  });

  it('retention (README "Configuration": 168 h, 2 GiB, 600 s; 0 disables a limit) and tenant isolation', () => {
    expect(loadConfig({}).retention).toEqual({
      maxAgeHours: 168,
      maxBytes: 2 * 1024 ** 3,
      intervalMs: 600_000,
    });
    expect(loadConfig({}).tenantIsolation).toBe(false);
    const config = loadConfig({
      RETENTION_MAX_AGE_HOURS: '0',
      RETENTION_MAX_BYTES: '1048576',
      RETENTION_INTERVAL_SECONDS: '30',
      TENANT_ISOLATION: 'true',
      API_KEYS: 'alpha,beta',
    });
    expect(config.retention).toEqual({ maxAgeHours: 0, maxBytes: 1048576, intervalMs: 30_000 });
    expect(config.tenantIsolation).toBe(true);
    expect(() => loadConfig({ RETENTION_MAX_AGE_HOURS: '-1' })).toThrow(/RETENTION_MAX_AGE_HOURS/);
    expect(() => loadConfig({ RETENTION_MAX_BYTES: '1.5' })).toThrow(/RETENTION_MAX_BYTES/);
    expect(() => loadConfig({ RETENTION_INTERVAL_SECONDS: '0' })).toThrow(/RETENTION_INTERVAL_SECONDS/);
    expect(() => loadConfig({ TENANT_ISOLATION: 'true' })).toThrow(/API_KEYS/);
    expect(() => loadConfig({ TENANT_ISOLATION: 'maybe', API_KEYS: 'a' })).toThrow(/TENANT_ISOLATION/);
  });
});
