import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { deflateRawSync } from 'node:zlib';
import { ZipArchive } from 'archiver';
import { afterAll, describe, expect, it } from 'vitest';
import { DomainError } from '@server/errors';
import { isZip, readZip, sanitizeEntryName } from '@server/lib/zip-reader';

/** Build a ZIP in memory with archiver (a general-purpose registry library, not our code). */
async function makeZip(entries: { name: string; content: string | Buffer; store?: boolean }[]): Promise<Buffer> {
  const archive = new ZipArchive({ zlib: { level: 9 } });
  const chunks: Buffer[] = [];
  archive.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<void>((resolve, reject) => {
    archive.on('end', () => resolve());
    archive.on('error', reject);
  });
  for (const e of entries) archive.append(e.content, { name: e.name, store: e.store });
  await archive.finalize();
  await done;
  return Buffer.concat(chunks);
}

/**
 * A hand-made one-entry ZIP (PKWARE APPNOTE 4.3.7 local header, 4.3.12 central header, 4.3.16
 * end record) whose headers declare `declaredSize` uncompressed bytes: lets a test lie about sizes.
 */
function handMadeZip(name: string, content: Buffer, declaredSize: number): Buffer {
  const data = deflateRawSync(content);
  const nameBuf = Buffer.from(name, 'utf8');
  const local = Buffer.alloc(30);
  local.writeUInt32LE(0x04034b50, 0);
  local.writeUInt16LE(20, 4);
  local.writeUInt16LE(0x800, 6);
  local.writeUInt16LE(8, 8);
  local.writeUInt32LE(0, 14); // CRC-32 left 0: the reader must refuse before or while checking
  local.writeUInt32LE(data.length, 18);
  local.writeUInt32LE(declaredSize, 22);
  local.writeUInt16LE(nameBuf.length, 26);
  const central = Buffer.alloc(46);
  central.writeUInt32LE(0x02014b50, 0);
  central.writeUInt16LE(20, 4);
  central.writeUInt16LE(20, 6);
  central.writeUInt16LE(0x800, 8);
  central.writeUInt16LE(8, 10);
  central.writeUInt32LE(data.length, 20);
  central.writeUInt32LE(declaredSize, 24);
  central.writeUInt16LE(nameBuf.length, 28);
  central.writeUInt32LE(0, 42);
  const localPart = Buffer.concat([local, nameBuf, data]);
  const centralPart = Buffer.concat([central, nameBuf]);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(1, 8);
  end.writeUInt16LE(1, 10);
  end.writeUInt32LE(centralPart.length, 12);
  end.writeUInt32LE(localPart.length, 16);
  return Buffer.concat([localPart, centralPart, end]);
}

const water = '3\nwater\nO 0 0 0.1173\nH 0 0.7572 -0.4692\nH 0 -0.7572 -0.4692\n';
const tmp = mkdtempSync(join(tmpdir(), 'pf-zip-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('readZip', () => {
  it('returns every file with its content, skipping directories, __MACOSX and .DS_Store', async () => {
    const zip = await makeZip([
      { name: 'batch/', content: '' },
      { name: 'batch/water.xyz', content: water },
      { name: 'batch/ions.sdf', content: 'x', store: true },
      { name: '__MACOSX/batch/._water.xyz', content: 'resource fork' },
      { name: 'batch/.DS_Store', content: 'finder' },
    ]);
    expect(isZip(zip)).toBe(true);
    const entries = await readZip(zip);
    expect(entries.map((e) => e.name)).toEqual(['batch/water.xyz', 'batch/ions.sdf']);
    expect(entries[0].content.toString('utf8')).toBe(water);
  });

  it('reads from a file path too', async () => {
    const path = join(tmp, 'one.zip');
    writeFileSync(path, await makeZip([{ name: 'a.xyz', content: water }]));
    const entries = await readZip(path);
    expect(entries).toEqual([{ name: 'a.xyz', content: Buffer.from(water) }]);
  });

  it('sanitises traversal and absolute names for display instead of trusting them, and keeps names unique', async () => {
    const zip = await makeZip([
      { name: '../../etc/evil.xyz', content: water },
      { name: 'etc/evil.xyz', content: water },
    ]);
    const names = (await readZip(zip)).map((e) => e.name);
    expect(names).toEqual(['etc/evil.xyz', 'etc/evil.xyz (2)']);
    expect(sanitizeEntryName('C:\\Users\\me\\..\\x.xyz')).toBe('Users/me/x.xyz');
    expect(sanitizeEntryName('/abs/./a\u0007b.xyz')).toBe('abs/ab.xyz');
  });

  it('refuses a ZIP bomb (an entry expanding far beyond the ratio limit) with a clear message', async () => {
    // 8 MiB of zeros deflate to about 8 KiB: a ratio near 1000×.
    const zip = await makeZip([{ name: 'zeros.xyz', content: Buffer.alloc(8 * 1024 * 1024) }]);
    const err = await readZip(zip, { label: 'upload.zip' }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(DomainError);
    expect((err as DomainError).code).toBe('too-large');
    expect((err as Error).message).toMatch(/^upload\.zip: entry 'zeros\.xyz' expands \d+× \(limit 200×\) to 8\.0 MiB; refused as a possible ZIP bomb$/);
  });

  it('refuses a hand-made bomb whose headers understate the size (declared 100 bytes, inflates to 3 MiB)', async () => {
    const zip = handMadeZip('liar.xyz', Buffer.alloc(3 * 1024 * 1024, 0x41), 100);
    const err = await readZip(zip, { label: 'liar.zip' }).catch((e: unknown) => e);
    expect((err as DomainError).code).toBe('too-large');
    expect((err as Error).message).toBe(
      "liar.zip: entry 'liar.xyz' holds more data than its header declares; refused as a possible ZIP bomb",
    );
  });

  it('refuses too many entries and too many total bytes', async () => {
    const many = await makeZip(Array.from({ length: 5 }, (_, i) => ({ name: `f${i}.xyz`, content: water })));
    await expect(readZip(many, { maxEntries: 4 })).rejects.toThrow('archive.zip: 5 entries exceeds the limit of 4');
    await expect(readZip(many, { maxTotalBytes: 100 })).rejects.toThrow(/expand to more than/);
  });

  it('reports a file that is not a ZIP, or a truncated one, as bad input', async () => {
    const err = await readZip(Buffer.from('not a zip at all'), { label: 'x.zip' }).catch((e: unknown) => e);
    expect((err as DomainError).code).toBe('bad-request');
    expect((err as Error).message).toMatch(/^x\.zip: not a readable ZIP archive/);
    const zip = await makeZip([{ name: 'a.xyz', content: water }]);
    await expect(readZip(zip.subarray(0, zip.length - 30))).rejects.toThrow(/not a readable ZIP archive/);
  });
});
