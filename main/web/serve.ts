// `npm run web`: serves the built renderer on loopback and prints its URL.
import path from 'node:path';
import { startStaticServer } from './static-server';

const port = Number(process.env.PORT ?? 5173);
if (!Number.isInteger(port) || port < 0 || port > 65535) {
  process.stderr.write(`PORT must be a whole number from 0 to 65535, got ${process.env.PORT}\n`);
  process.exit(2);
}
const root = path.join(__dirname, '..', 'renderer');
startStaticServer(root, port).then(
  (server) => process.stdout.write(`Layline is running in the browser at ${server.url} (Ctrl+C to stop)\n`),
  (err: unknown) => {
    process.stderr.write(`could not start the web server: ${err instanceof Error ? err.message : String(err)}\n`);
    process.exit(1);
  },
);
