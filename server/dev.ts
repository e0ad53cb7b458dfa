/**
 * `npm run dev`: the API on its own port with no built dashboard, and Vite's dev server on the
 * public port proxying /api to it (vite.config.ts), so the CLI's default URL keeps working.
 */
import { createServer } from 'vite';
import { readConfig } from './config';
import { startServer } from './index';

const publicConfig = readConfig();
const apiPort = Number(process.env.VANBAY_DEV_API_PORT ?? 5181);
const api = await startServer({
  config: { ...publicConfig, port: apiPort, host: '127.0.0.1' },
  serveClient: false,
});
const vite = await createServer({ server: { port: publicConfig.port } });
await vite.listen();
vite.printUrls();
console.log(`API on ${api.url} behind the dev server's /api proxy.`);

const stop = async () => {
  await vite.close();
  await api.stop();
  process.exit(0);
};
process.once('SIGINT', stop);
process.once('SIGTERM', stop);
