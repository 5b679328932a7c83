// The stand-ins for hosted services that `npm start` and `npm test` run on loopback, in one
// process of their own that every app instance shares: the S3-compatible photo store (`--s3 DIR`)
// and the SMTP sink (`--mail PORT`, its list of caught messages on a free HTTP port). When ready
// it prints one line, `local services ready {settings as JSON}`, for the parent to pass on to the
// app. It stops on SIGTERM or SIGINT, and when the process that started it is gone.
import path from 'node:path';
import { startS3Fake, type S3Fake } from '../storage/s3-fake';
import { startMailSink, type MailSink } from '../mail/sink';

/** The bucket the local fake keeps photos in. */
export const LOCAL_BUCKET = 'twistlog-photos';

const arg = (name: string) => {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
};

async function main() {
  const s3Dir = arg('--s3');
  const mailPort = arg('--mail');
  let s3: S3Fake | undefined;
  let mail: MailSink | undefined;
  const stop = async () => {
    await Promise.allSettled([s3?.close(), mail?.close()]);
    process.exit(0);
  };
  process.on('SIGTERM', () => void stop());
  process.on('SIGINT', () => void stop());
  const parent = process.ppid;
  setInterval(() => {
    if (process.ppid !== parent) void stop();
  }, 1000).unref();

  const settings: Record<string, string> = {};
  if (s3Dir) {
    s3 = await startS3Fake({ dir: path.resolve(s3Dir), bucket: LOCAL_BUCKET });
    Object.assign(settings, s3.env);
  }
  if (mailPort !== undefined) {
    mail = await startMailSink({ port: Number(mailPort), host: '127.0.0.1', httpPort: 0 });
    Object.assign(settings, { SMTP_HOST: '127.0.0.1', SMTP_PORT: String(mail.port), MAIL_SINK_URL: mail.listUrl! });
  }
  process.stdout.write(`local services ready ${JSON.stringify(settings)}\n`);
}

main().catch((err) => {
  process.stderr.write(`local services failed to start: ${err?.stack ?? err}\n`);
  process.exit(1);
});
