import { mkdtempSync, rmSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from './config';

const dir = mkdtempSync(join(tmpdir(), 'clearbase-config-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('upload limits and queue concurrency', () => {
  it('default to 1 GiB and 100 files per upload, 120 MP per scan, 1 GiB validated at once and one frame per core', () => {
    const config = loadConfig({ DATA_DIR: dir });
    expect(config.uploads).toEqual({
      maxFileBytes: 1024 ** 3,
      maxFiles: 100,
      maxPixels: 120_000_000,
      validationMemoryBytes: 1024 ** 3,
    });
    expect(config.jobConcurrency).toBe(availableParallelism());
  });

  it('are set from the environment', () => {
    const config = loadConfig({
      DATA_DIR: dir,
      UPLOAD_MAX_FILE_BYTES: '2048',
      UPLOAD_MAX_FILES: '3',
      UPLOAD_MAX_PIXELS: '5000',
      UPLOAD_VALIDATION_MEMORY_MB: '256',
      JOB_CONCURRENCY: '1',
    });
    expect(config.uploads).toEqual({
      maxFileBytes: 2048,
      maxFiles: 3,
      maxPixels: 5000,
      validationMemoryBytes: 256 * 1024 ** 2,
    });
    expect(config.jobConcurrency).toBe(1);
  });

  it('name the variable with a bad value', () => {
    expect(() => loadConfig({ DATA_DIR: dir, JOB_CONCURRENCY: '0' })).toThrow(ConfigError);
    expect(() => loadConfig({ DATA_DIR: dir, UPLOAD_MAX_FILES: 'many' })).toThrow(/UPLOAD_MAX_FILES/);
    expect(() => loadConfig({ DATA_DIR: dir, UPLOAD_VALIDATION_MEMORY_MB: '32' })).toThrow(
      /UPLOAD_VALIDATION_MEMORY_MB/,
    );
  });
});

describe('the download link validity', () => {
  it('is a week by default and is set in hours by DOWNLOAD_LINK_HOURS', () => {
    expect(loadConfig({ DATA_DIR: dir }).downloadLinkHours).toBe(168);
    expect(loadConfig({ DATA_DIR: dir, DOWNLOAD_LINK_HOURS: '36' }).downloadLinkHours).toBe(36);
  });

  it('refuses less than an hour or more than 90 days, naming the variable', () => {
    expect(() => loadConfig({ DATA_DIR: dir, DOWNLOAD_LINK_HOURS: '0' })).toThrow(/DOWNLOAD_LINK_HOURS/);
    expect(() => loadConfig({ DATA_DIR: dir, DOWNLOAD_LINK_HOURS: '2161' })).toThrow(/DOWNLOAD_LINK_HOURS/);
    expect(() => loadConfig({ DATA_DIR: dir, DOWNLOAD_LINK_HOURS: '1.5' })).toThrow(ConfigError);
  });
});

describe('the sign-up clean-up interval', () => {
  it('is an hour by default and is set in minutes by SIGNUP_CLEANUP_INTERVAL_MINUTES', () => {
    expect(loadConfig({ DATA_DIR: dir }).signupCleanupIntervalMs).toBe(3600_000);
    expect(loadConfig({ DATA_DIR: dir, SIGNUP_CLEANUP_INTERVAL_MINUTES: '5' }).signupCleanupIntervalMs).toBe(
      300_000,
    );
    expect(() => loadConfig({ DATA_DIR: dir, SIGNUP_CLEANUP_INTERVAL_MINUTES: '0' })).toThrow(
      /SIGNUP_CLEANUP_INTERVAL_MINUTES/,
    );
  });
});
