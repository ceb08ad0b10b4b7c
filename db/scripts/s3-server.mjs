// A local stand-in for a hosted object store: s3rver (a fake S3 server) on 127.0.0.1 keeping its
// objects under a directory inside the checkout (.data/, git-ignored), with Firmsand's bucket made
// at start. The app reaches it only through app/lib/storage/ and @aws-sdk/client-s3, as it would a
// real S3-compatible store.
//   node db/scripts/s3-server.mjs <port> <directory> <bucket>
import { mkdirSync } from "node:fs";
import S3rver from "s3rver";

const port = Number(process.argv[2] ?? 4568);
const directory = process.argv[3];
const bucket = process.argv[4];
if (!directory || !bucket) {
  process.stderr.write("usage: s3-server.mjs <port> <directory> <bucket>\n");
  process.exit(2);
}
mkdirSync(directory, { recursive: true });

const server = new S3rver({ port, address: "127.0.0.1", directory, silent: true, configureBuckets: [{ name: bucket }] });
await server.run();
process.stderr.write(`fake S3 listening on 127.0.0.1:${port}, bucket ${bucket}, objects in ${directory}\n`);

for (const signal of ["SIGTERM", "SIGINT"]) {
  process.on(signal, () => server.close().then(() => process.exit(0), () => process.exit(1)));
}
