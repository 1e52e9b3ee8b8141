import path from "node:path";
import { parseArgs } from "node:util";
import { startS3Fake } from "./s3-fake";
import { startSmtpFake } from "./smtp-fake";

/**
 * `tsx ingest-server/src/dev/fakes.ts --data <dir> --s3-port N --smtp-port M [--bucket B]`
 * Runs the local S3 and SMTP fakes for scripts/start.sh. Objects go to <dir>/s3, captured mail to
 * <dir>/mailbox (point DEV_MAILBOX_DIR there). Prints "fakes ready" once both listen.
 */
const { values } = parseArgs({
  options: {
    data: { type: "string" },
    "s3-port": { type: "string" },
    "smtp-port": { type: "string" },
    bucket: { type: "string", default: process.env.S3_BUCKET ?? "pendula-raw" },
  },
});

const problems: string[] = [];
const port = (name: "s3-port" | "smtp-port") => {
  const n = Number(values[name]);
  if (!Number.isInteger(n) || n < 1 || n > 65535) problems.push(`--${name} must be a port number`);
  return n;
};
if (!values.data) problems.push("--data <dir> is required");
const s3Port = port("s3-port");
const smtpPort = port("smtp-port");
if (problems.length) {
  console.error(`fakes: ${problems.join("; ")}`);
  process.exit(2);
}

const data = path.resolve(values.data as string);
const s3 = await startS3Fake({ directory: path.join(data, "s3"), bucket: values.bucket as string, port: s3Port });
const smtp = await startSmtpFake({ directory: path.join(data, "mailbox"), port: smtpPort });
console.log(`s3 fake ${s3.endpoint} bucket ${values.bucket}`);
console.log(`smtp fake 127.0.0.1:${smtp.port} mailbox ${smtp.directory}`);
console.log("fakes ready");

async function stop(): Promise<void> {
  await Promise.allSettled([s3.close(), smtp.close()]);
  process.exit(0);
}
process.on("SIGTERM", () => void stop());
process.on("SIGINT", () => void stop());
