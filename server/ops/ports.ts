import net from 'node:net';
import { OpsError } from './util';

/** True when nothing listens on host:port (we could bind it ourselves). */
export function isPortFree(port: number, host = '127.0.0.1'): Promise<boolean> {
  return new Promise((resolve) => {
    const server = net.createServer();
    server.unref();
    server.once('error', () => resolve(false));
    server.listen({ port, host, exclusive: true }, () => server.close(() => resolve(true)));
  });
}

/** True when something accepts TCP connections on host:port. */
export function isPortOpen(port: number, host = '127.0.0.1', timeoutMs = 1000): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ port, host });
    const done = (open: boolean) => {
      socket.destroy();
      resolve(open);
    };
    socket.setTimeout(timeoutMs, () => done(false));
    socket.once('connect', () => done(true));
    socket.once('error', () => done(false));
  });
}

/** The error shown when a port we need is taken: names the port, its use and the variable that moves it. */
export function portInUseError(port: number, what: string, variable: string, host = '127.0.0.1'): OpsError {
  return new OpsError(
    `port ${port} on ${host} (${what}) is already in use`,
    `stop whatever listens there (see \`ss -ltnp 'sport = :${port}'\`) or choose another port with ${variable}`,
  );
}

/** Throws a one-line OpsError for the first port of the list that is taken. */
export async function assertPortsFree(
  ports: { port: number; what: string; variable: string }[],
  host = '127.0.0.1',
): Promise<void> {
  for (const p of ports) {
    if (!(await isPortFree(p.port, host))) throw portInUseError(p.port, p.what, p.variable, host);
  }
}
