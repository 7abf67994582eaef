import S3rver from "s3rver";

/** The local stand-in for object storage (certificates, photos): an S3-compatible server on loopback. */
export async function startObjectStore(opts: { port: number; directory: string; bucket: string }) {
  const server = new S3rver({ port: opts.port, address: "127.0.0.1", silent: true, directory: opts.directory, configureBuckets: [{ name: opts.bucket }] });
  const addr = await server.run();
  return { port: addr.port, endpoint: `http://127.0.0.1:${addr.port}`, close: () => server.close() };
}
