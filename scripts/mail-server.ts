// The fake mail server process (`npm start` and `npm test` run it when SMTP_URL is not set).
import { mailDir, startCaptureServer } from '../src/lib/mail/capture';
import { env } from '../src/lib/server/env';

const e = env();
const dir = mailDir(e.HEATLAYER_DATA_DIR);
startCaptureServer({ host: '127.0.0.1', port: e.SMTP_PORT, dir })
  .then(() => console.log(`fake mail server on 127.0.0.1:${e.SMTP_PORT}; messages kept in ${dir}`))
  .catch((err) => {
    console.error('fake mail server failed to start:', err);
    process.exit(1);
  });
