/**
 * A real redis-server for the queue tests: Debian's package, started on a free loopback port in a temp folder, with
 * persistence off (or on, append-only with an fsync per write, for the restart test), and stopped by its pid.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';

export const REDIS_SERVER = process.env.FORMGLEAN_REDIS_SERVER || 'redis-server';

/** Null when redis-server runs, else the reason the queue tests cannot run here. */
export function missingRedisServer(): string | null {
  const run = spawnSync(REDIS_SERVER, ['--version'], { encoding: 'utf8', timeout: 10_000 });
  return run.error || run.status !== 0 ? `${REDIS_SERVER} is not installed (Debian: apt-get install redis-server)` : null;
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.unref();
    s.on('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

export interface TestRedis {
  port: number;
  url: string;
  dir: string;
  /** Stop the server (SIGTERM: with persistence on it writes its data first) and wait for it to exit. */
  stop(): Promise<void>;
  /** Start it again on the same port and folder (the restart test). */
  start(): Promise<void>;
  /** Stop and remove its folder. */
  dispose(): Promise<void>;
}

/** PEM files for a TLS-only server (the plain port is turned off). */
export interface TestTls {
  cert: string;
  key: string;
  ca: string;
}

export async function startRedis(options: { persist?: boolean; password?: string; tls?: TestTls } = {}): Promise<TestRedis> {
  const dir = await mkdtemp(path.join(tmpdir(), 'formglean-redis-'));
  const port = await freePort();
  const ports = options.tls
    ? ['--port', '0', '--tls-port', String(port), '--tls-cert-file', options.tls.cert, '--tls-key-file', options.tls.key, '--tls-ca-cert-file', options.tls.ca, '--tls-auth-clients', 'no']
    : ['--port', String(port)];
  const args = [...ports, '--bind', '127.0.0.1', '--dir', dir, '--save', '', '--daemonize', 'no', '--loglevel', 'warning'];
  if (options.persist) args.push('--appendonly', 'yes', '--appendfsync', 'always');
  else args.push('--appendonly', 'no');
  if (options.password) args.push('--requirepass', options.password);
  let child: ChildProcess | null = null;

  const start = async (): Promise<void> => {
    const c = spawn(REDIS_SERVER, args, { stdio: ['ignore', 'ignore', 'pipe'] });
    child = c;
    let err = '';
    c.stderr?.on('data', (d) => (err += d));
    // Ready once it answers PING over a socket.
    const deadline = Date.now() + 15_000;
    for (;;) {
      if (c.exitCode !== null) throw new Error(`redis-server exited: ${err.trim()}`);
      if (await (options.tls ? listening(port) : answers(port))) return;
      if (Date.now() > deadline) throw new Error('redis-server did not start in 15 s');
      await new Promise((r) => setTimeout(r, 100));
    }
  };
  const stop = async (): Promise<void> => {
    const c = child;
    if (!c || c.exitCode !== null) return;
    await new Promise<void>((resolve) => {
      c.once('exit', () => resolve());
      c.kill('SIGTERM');
    });
    child = null;
  };
  await start();
  const auth = options.password ? `:${encodeURIComponent(options.password)}@` : '';
  return {
    port,
    url: `${options.tls ? 'rediss' : 'redis'}://${auth}127.0.0.1:${port}`,
    dir,
    stop,
    start,
    dispose: async () => {
      await stop();
      await rm(dir, { recursive: true, force: true });
    },
  };
}

async function answers(port: number): Promise<boolean> {
  const { connect } = await import('node:net');
  return new Promise((resolve) => {
    const s = connect(port, '127.0.0.1');
    let got = '';
    s.setTimeout(1000, () => {
      s.destroy();
      resolve(false);
    });
    s.on('error', () => resolve(false));
    s.on('connect', () => s.write('PING\r\n'));
    s.on('data', (d) => {
      got += d;
      // +PONG, or -NOAUTH when a password is set: either way the server is up.
      if (got.includes('\r\n')) {
        s.destroy();
        resolve(true);
      }
    });
  });
}

/** Whether something accepts connections on the port (a TLS server does not answer a plain PING). */
async function listening(port: number): Promise<boolean> {
  const { connect } = await import('node:net');
  return new Promise((resolve) => {
    const s = connect(port, '127.0.0.1');
    s.on('error', () => resolve(false));
    s.on('connect', () => {
      s.destroy();
      resolve(true);
    });
  });
}

/**
 * A private certificate authority and a server certificate for 127.0.0.1 it signed, made with openssl in `dir`; null
 * when openssl is missing.
 */
export function makeTestTls(dir: string): TestTls | null {
  const run = (args: string[]) => spawnSync('openssl', args, { cwd: dir, encoding: 'utf8', timeout: 60_000 });
  if (run(['version']).error) return null;
  const steps = [
    ['req', '-x509', '-newkey', 'rsa:2048', '-nodes', '-keyout', 'ca.key', '-out', 'ca.pem', '-days', '2', '-subj', '/CN=formglean test CA'],
    ['req', '-newkey', 'rsa:2048', '-nodes', '-keyout', 'server.key', '-out', 'server.csr', '-subj', '/CN=127.0.0.1'],
    ['x509', '-req', '-in', 'server.csr', '-CA', 'ca.pem', '-CAkey', 'ca.key', '-CAcreateserial', '-out', 'server.pem', '-days', '2', '-extfile', 'san.cnf'],
  ];
  writeFileSync(path.join(dir, 'san.cnf'), 'subjectAltName=IP:127.0.0.1\n');
  for (const s of steps) {
    const r = run(s);
    if (r.status !== 0) throw new Error(`openssl ${s[0]}: ${r.stderr.trim()}`);
  }
  return { cert: path.join(dir, 'server.pem'), key: path.join(dir, 'server.key'), ca: path.join(dir, 'ca.pem') };
}
