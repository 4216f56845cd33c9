import http from 'node:http';
import type { AddressInfo } from 'node:net';

/**
 * An HTTP proxy that can let a request reach the server and then cut the connection before the answer gets back,
 * so a test sees exactly what a device sees when its network drops after the server committed.
 */
export class CuttingProxy {
  private server: http.Server;
  /** Decides per request: 'pass', 'drop-response' (forward, wait for the answer, then destroy the socket), 'refuse'. */
  decide: (req: http.IncomingMessage) => 'pass' | 'drop-response' | 'refuse' = () => 'pass';
  readonly log: { method: string; path: string; outcome: string; uploadOffset?: string }[] = [];
  url = '';

  constructor(private readonly target: string) {
    this.server = http.createServer((req, res) => this.handle(req, res));
  }

  async start(): Promise<void> {
    await new Promise<void>((resolve) => this.server.listen(0, '127.0.0.1', resolve));
    this.url = `http://127.0.0.1:${(this.server.address() as AddressInfo).port}`;
  }

  async stop(): Promise<void> {
    this.server.closeAllConnections();
    await new Promise<void>((resolve) => this.server.close(() => resolve()));
  }

  private handle(req: http.IncomingMessage, res: http.ServerResponse): void {
    const outcome = this.decide(req);
    this.log.push({
      method: req.method ?? '',
      path: req.url ?? '',
      outcome,
      uploadOffset: req.headers['upload-offset'] as string | undefined,
    });
    if (outcome === 'refuse') {
      req.socket.destroy();
      return;
    }
    const target = new URL(req.url ?? '/', this.target);
    const upstream = http.request(
      target.toString(),
      { method: req.method, headers: { ...req.headers, host: req.headers.host } },
      (answer) => {
        if (outcome === 'drop-response') {
          answer.resume();
          answer.on('end', () => req.socket.destroy());
          return;
        }
        res.writeHead(answer.statusCode ?? 502, answer.headers);
        answer.pipe(res);
      },
    );
    upstream.on('error', () => req.socket.destroy());
    req.pipe(upstream);
  }
}
