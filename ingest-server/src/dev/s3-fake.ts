import { mkdirSync } from "node:fs";
import S3rver from "s3rver";

export interface S3Fake {
  endpoint: string;
  port: number;
  close(): Promise<void>;
}

/** A local S3-compatible server (s3rver) on loopback, storing objects under `directory`. */
export async function startS3Fake(options: { directory: string; bucket: string; port?: number }): Promise<S3Fake> {
  mkdirSync(options.directory, { recursive: true });
  const server = new S3rver({
    address: "127.0.0.1",
    port: options.port ?? 0,
    directory: options.directory,
    silent: true,
    vhostBuckets: false,
    configureBuckets: [{ name: options.bucket }],
  });
  const address = await server.run();
  return {
    endpoint: `http://127.0.0.1:${address.port}`,
    port: address.port,
    close: () => server.close(),
  };
}

/** s3rver accepts these and checks signatures against them. */
export const S3_FAKE_CREDENTIALS = { accessKeyId: "S3RVER", secretAccessKey: "S3RVER" } as const;
