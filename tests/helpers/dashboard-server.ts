import type { AddressInfo } from 'node:net';
import { createApp } from '../../server/app';
import { CLIENT_DIR } from '../../server/build-client';
import { cloneDatabase, tempUploadsDir } from './db';

/** The built dashboard and the API over a seeded database clone, on a loopback port. */
export async function startDashboardServer(): Promise<{ url: string; close(): Promise<void> }> {
  const database = await cloneDatabase('seeded');
  const server = createApp({ db: database.db, clientDir: CLIENT_DIR, uploadsDir: tempUploadsDir() }).listen(
    0,
    '127.0.0.1',
  );
  await new Promise((resolve) => server.once('listening', resolve));
  return {
    url: `http://127.0.0.1:${(server.address() as AddressInfo).port}`,
    close: async () => {
      await new Promise((resolve) => server.close(resolve));
      await database.close();
    },
  };
}
