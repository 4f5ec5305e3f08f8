import { mkdtempSync, readdirSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { abandonedUploadMs, clearUploadDir } from '@server/holdouts/upload-dir';

let dir: string;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'scorecourt-upload-dir-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

describe('the upload staging folder at start-up', () => {
  it('is emptied when it is this server’s alone', () => {
    writeFileSync(join(dir, 'a'), 'x');
    writeFileSync(join(dir, 'b'), 'y');
    expect(clearUploadDir(dir)).toBe(2);
    expect(readdirSync(dir)).toEqual([]);
  });

  it('keeps other instances’ uploads in progress when shared, and removes only abandoned ones', () => {
    writeFileSync(join(dir, 'in-progress'), 'x');
    writeFileSync(join(dir, 'abandoned'), 'y');
    const old = (Date.now() - abandonedUploadMs - 60_000) / 1000;
    utimesSync(join(dir, 'abandoned'), old, old);
    expect(clearUploadDir(dir, { olderThanMs: abandonedUploadMs })).toBe(1);
    expect(readdirSync(dir)).toEqual(['in-progress']);
  });
});
