import { createWriteStream } from 'node:fs';
import { mkdir, mkdtemp, readFile, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { basename, dirname, join, resolve, sep } from 'node:path';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { parseArgs } from 'node:util';
import yauzl from 'yauzl';

const USAGE = `usage: pointfold submit FILE... --server URL --token TOKEN [--tolerance Å] [--wait] [--out DIR]
         [--target GROUP|perceived|computational] [--frame standard|input] [--formats xyz,qcschema,...]
         [--name NAME] [--workspace SLUG]
  The token may also come from the environment: POINTFOLD_TOKEN.`;

const FINAL = new Set(['done', 'failed', 'cancelled']);

interface BatchJson {
  id: string;
  name: string;
  status: string;
  workspaceSlug: string;
  counts: { total: number; done: number; clean: number; overBudget: number; knifeEdge: number; error: number };
  groups: { group: string; count: number }[];
}

class CliError extends Error {}

const err = (line: string) => process.stderr.write(`${line}\n`);

/** A client for the Pointfold API with a token; errors become one-line CliErrors. */
function apiClient(server: string, token: string) {
  const base = server.replace(/\/+$/, '');
  const headers = { Authorization: `Bearer ${token}`, Accept: 'application/json' };
  async function request(path: string, init: RequestInit = {}): Promise<Response> {
    let res: Response;
    try {
      res = await fetch(`${base}${path}`, { ...init, headers: { ...headers, ...(init.headers ?? {}) } });
    } catch (e) {
      const cause = (e as { cause?: { code?: string; message?: string } }).cause;
      throw new CliError(`cannot reach ${base} (${cause?.code ?? cause?.message ?? (e as Error).message})`);
    }
    if (!res.ok) {
      let message = `${res.status} ${res.statusText}`;
      try {
        const body = (await res.json()) as { error?: { message?: string } };
        if (body.error?.message) message = `${body.error.message} (HTTP ${res.status})`;
      } catch {
        /* not JSON */
      }
      throw new CliError(message);
    }
    return res;
  }
  return {
    base,
    request,
    async json<T>(path: string, init?: RequestInit): Promise<T> {
      return (await request(path, init)).json() as Promise<T>;
    },
  };
}

/** `--target` as a TargetPolicy. */
function targetOf(text: string | undefined) {
  if (!text) return undefined;
  if (text === 'perceived' || text === 'computational') return { kind: text };
  return { kind: 'group', group: text };
}

/**
 * Unpacks the batch ZIP into `dir`. Entry names are cleaned (no absolute paths, no `..`) and
 * every target is checked to stay inside `dir` before anything is written.
 */
export async function unpackZip(zipPath: string, dir: string): Promise<string[]> {
  const root = resolve(dir);
  await mkdir(root, { recursive: true });
  const zip = await new Promise<yauzl.ZipFile>((ok, fail) =>
    yauzl.open(zipPath, { lazyEntries: true, autoClose: true }, (e, z) => (e || !z ? fail(e ?? new Error('no archive')) : ok(z))),
  );
  const written: string[] = [];
  await new Promise<void>((ok, fail) => {
    zip.on('error', fail);
    zip.on('end', () => ok());
    zip.on('entry', (entry: yauzl.Entry) => {
      const clean = entry.fileName
        .replace(/\\/g, '/')
        .split('/')
        .filter((p) => p !== '' && p !== '.' && p !== '..' && !/^[A-Za-z]:$/.test(p))
        .join('/');
      const target = resolve(root, clean);
      if (!clean || entry.fileName.endsWith('/') || !target.startsWith(root + sep)) {
        zip.readEntry();
        return;
      }
      zip.openReadStream(entry, async (e, stream) => {
        if (e || !stream) return fail(e ?? new Error('unreadable entry'));
        try {
          await mkdir(dirname(target), { recursive: true });
          await pipeline(stream, createWriteStream(target));
          written.push(target);
          zip.readEntry();
        } catch (x) {
          fail(x);
        }
      });
    });
    zip.readEntry();
  });
  return written;
}

const mib = (n: number) => `${(n / 1024 / 1024).toFixed(1)} MiB`;

/**
 * `pointfold submit`: uploads files as a batch through the API with an API token, shows progress
 * on stderr, and with --wait waits for the batch; with --out it downloads the batch ZIP and
 * unpacks the cleaned files, manifest.json and summary.csv into DIR. stdout gets the batch id.
 * Exit status: 0 when every structure was snapped; 1 when the batch failed or was cancelled, or
 * some structures could not be read or snapped (each named on stderr); 2 for a usage error.
 */
export async function run(argv: string[]): Promise<number> {
  const args = argv[0] === 'submit' ? argv.slice(1) : argv;
  let parsed;
  try {
    parsed = parseArgs({
      args,
      allowPositionals: true,
      options: {
        server: { type: 'string' },
        token: { type: 'string' },
        tolerance: { type: 'string' },
        target: { type: 'string' },
        frame: { type: 'string' },
        formats: { type: 'string' },
        name: { type: 'string' },
        workspace: { type: 'string' },
        wait: { type: 'boolean', default: false },
        out: { type: 'string' },
        help: { type: 'boolean', short: 'h' },
      },
    });
  } catch (e) {
    err(`pointfold submit: ${(e as Error).message}\n${USAGE}`);
    return 2;
  }
  const { values, positionals: files } = parsed;
  if (values.help) {
    process.stdout.write(`${USAGE}\n`);
    return 0;
  }
  const token = values.token ?? process.env.POINTFOLD_TOKEN;
  const problems = [
    files.length === 0 && 'no FILE given',
    !values.server && 'missing --server URL',
    !token && 'missing --token TOKEN (or POINTFOLD_TOKEN)',
    values.tolerance !== undefined && !(Number(values.tolerance) > 0) && `--tolerance must be a positive number of Å, not '${values.tolerance}'`,
    values.frame !== undefined && !['standard', 'input'].includes(values.frame) && `--frame must be standard or input, not '${values.frame}'`,
  ].filter(Boolean);
  if (problems.length > 0) {
    err(`pointfold submit: ${problems.join('; ')}\n${USAGE}`);
    return 2;
  }
  const wait = values.wait || values.out !== undefined;
  const api = apiClient(values.server!, token!);
  const tty = process.stderr.isTTY;

  try {
    // Which workspace: --workspace, else the token's own (a token is bound to one).
    let slug = values.workspace;
    if (!slug) {
      const me = await api.json<{ memberships: { workspace: { slug: string } }[] }>('/api/me');
      if (me.memberships.length !== 1) {
        throw new CliError(`the token sees ${me.memberships.length} workspaces; choose one with --workspace`);
      }
      slug = me.memberships[0].workspace.slug;
    }

    const form = new FormData();
    let bytes = 0;
    for (const file of files) {
      let content: Buffer;
      try {
        if (!(await stat(file)).isFile()) throw new CliError(`${file}: not a file`);
        content = await readFile(file);
      } catch (e) {
        if (e instanceof CliError) throw e;
        throw new CliError(`${file}: ${(e as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : (e as Error).message}`);
      }
      bytes += content.length;
      form.append('files', new Blob([new Uint8Array(content)]), basename(file));
    }
    const settings: Record<string, unknown> = {};
    if (values.tolerance !== undefined) settings.tolerance = Number(values.tolerance);
    if (values.target) settings.target = targetOf(values.target);
    if (values.frame) settings.frame = values.frame;
    if (values.formats) settings.outputFormats = values.formats.split(',').map((f) => f.trim()).filter(Boolean);
    form.append('settings', JSON.stringify(settings));
    if (values.name) form.append('name', values.name);

    // Encode the form once to count bytes as they go out (upload progress).
    const encoded = new Response(form);
    let sent = 0;
    let lastShown = 0;
    const counted = encoded.body!.pipeThrough(
      new TransformStream<Uint8Array, Uint8Array>({
        transform(chunk, controller) {
          sent += chunk.byteLength;
          if (tty && Date.now() - lastShown > 200) {
            lastShown = Date.now();
            process.stderr.write(`\ruploading ${mib(Math.min(sent, bytes))} of ${mib(bytes)}`);
          }
          controller.enqueue(chunk);
        },
      }),
    );
    err(`uploading ${files.length} file${files.length === 1 ? '' : 's'} (${mib(bytes)}) to ${api.base} …`);
    const created = await api.json<BatchJson>(`/api/workspaces/${encodeURIComponent(slug)}/batches`, {
      method: 'POST',
      body: counted,
      headers: { 'Content-Type': encoded.headers.get('content-type')! },
      duplex: 'half',
    } as RequestInit);
    if (tty) process.stderr.write('\r\x1b[K');
    err(`batch ${created.id} "${created.name}": ${created.counts.total} structures, ${created.counts.error} unreadable`);
    process.stdout.write(`${created.id}\n`);
    if (!wait) return 0;

    // Poll until the batch is final; print progress on change.
    let batch = created;
    let shown = '';
    for (;;) {
      const c = batch.counts;
      const line = `${batch.status}: ${c.done + c.error} of ${c.total} finished (${c.done} snapped, ${c.error} errors)`;
      if (line !== shown) {
        if (tty) process.stderr.write(`\r\x1b[K${line}`);
        else err(line);
        shown = line;
      }
      if (FINAL.has(batch.status)) break;
      await new Promise((r) => setTimeout(r, 1000));
      batch = await api.json<BatchJson>(`/api/batches/${batch.id}`);
    }
    if (tty) process.stderr.write('\n');
    const c = batch.counts;
    err(
      `batch ${batch.status}: ${c.done} snapped (${c.clean} clean, ${c.overBudget} over budget, ${c.knifeEdge} knife-edge), ${c.error} errors` +
        (batch.groups.length ? `; groups ${batch.groups.map((g) => `${g.group}×${g.count}`).join(' ')}` : ''),
    );

    // Name every structure that could not be read or snapped, one line each.
    if (c.error > 0) {
      for (let page = 1; ; page++) {
        const rows = await api.json<{ items: { sourceFile: string; frameIndex: number; error: string | null }[]; total: number }>(
          `/api/batches/${batch.id}/structures?status=error&pageSize=500&page=${page}`,
        );
        for (const r of rows.items) {
          const msg = r.error ?? 'unknown error';
          err(msg.startsWith(r.sourceFile) ? msg : `${r.sourceFile}: frame ${r.frameIndex + 1}: ${msg}`);
        }
        if (page * 500 >= rows.total) break;
      }
    }

    if (values.out !== undefined && batch.status !== 'cancelled') {
      const tmp = await mkdtemp(join(tmpdir(), 'pointfold-'));
      try {
        const zipPath = join(tmp, 'batch.zip');
        const res = await api.request(`/api/batches/${batch.id}/download`);
        let received = 0;
        const body = Readable.fromWeb(res.body as import('node:stream/web').ReadableStream<Uint8Array>);
        body.on('data', (chunk: Buffer) => {
          received += chunk.length;
          if (tty) process.stderr.write(`\r\x1b[Kdownloading ${mib(received)}`);
        });
        await pipeline(body, createWriteStream(zipPath));
        if (tty) process.stderr.write('\r\x1b[K');
        const written = await unpackZip(zipPath, values.out);
        err(`${written.length} files written to ${resolve(values.out)} (cleaned files, manifest.json, summary.csv)`);
      } finally {
        await rm(tmp, { recursive: true, force: true });
      }
    }
    return batch.status === 'done' && c.error === 0 ? 0 : 1;
  } catch (e) {
    if (tty) process.stderr.write('\r\x1b[K');
    if (e instanceof CliError) {
      err(`pointfold submit: ${e.message}`);
      return 1;
    }
    throw e;
  }
}
