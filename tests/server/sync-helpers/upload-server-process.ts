// The real app in a process of its own, so a test can kill it for real. Run with tsx; configured by environment:
// DATABASE_URL, JWT_SECRET, DATA_DIR (keys, blobs, uploads), PORT (0 = any), and
// KILL_AFTER_LAST_BYTE=1 (SIGKILL itself once an upload's last byte is written, before it is processed) or
// SKIP_STARTUP_SCAN=1 (start without processing staged uploads, so only a device's HEAD can).
// Prints one JSON line once listening: { port, scan }.
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import pino from 'pino';
import { createApp } from '@/sync-server/src/app';
import { createSequelize } from '@/sync-server/src/db/database';
import { LocalDiskBlobStore } from '@/sync-server/src/services/blob-store';
import { composeServices } from '@/sync-server/src/composition-root';
import { loadConfig } from '@/sync-server/src/config/settings';
import { ClinicKeyStore } from '@/sync-server/src/services/clinic-keys';
import { folderStaging } from '@/sync-server/src/services/tus-uploads';

async function main() {
  const env = process.env;
  const dataDir = env.DATA_DIR!;
  const sequelize = createSequelize(env.DATABASE_URL!, { poolMax: 3 });
  const services = composeServices(loadConfig(), sequelize, {
    blobStore: new LocalDiskBlobStore(path.join(dataDir, 'blobs')),
    clinicKeys: new ClinicKeyStore(path.join(dataDir, 'keys')),
    staging: folderStaging(path.join(dataDir, 'uploads')),
    afterLastByte: env.KILL_AFTER_LAST_BYTE === '1' ? () => process.kill(process.pid, 'SIGKILL') : undefined,
  });
  const app = createApp({
    sequelize,
    jwtSecret: env.JWT_SECRET!,
    services,
    logger: pino({ level: 'silent' }),
  });
  const server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(Number(env.PORT ?? 0), '127.0.0.1', resolve));
  const scan = env.SKIP_STARTUP_SCAN === '1' ? null : await services.uploads.processStaged();
  process.stdout.write(`${JSON.stringify({ port: (server.address() as AddressInfo).port, scan })}\n`);
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
